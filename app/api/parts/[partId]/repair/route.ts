// POST /api/parts/[partId]/repair: repair the part's current mesh (flip inconsistent faces, close small holes, drop duplicate and zero-area faces) into a new version.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { assertSameOrigin } from "@/lib/server/origin";
import { repairPartMesh } from "@/lib/server/mesh-health";
import { requirePartEdit } from "@/lib/server/parts";
import { requireUser } from "@/lib/server/session";
import { meshRepairInput } from "@/lib/validation/mesh-health";

type Ctx = { params: Promise<{ partId: string }> };

export async function POST(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).partId);
    // Who may change it is checked before the body is validated.
    await requirePartEdit(user, id);
    return NextResponse.json(await repairPartMesh(user, id, meshRepairInput.parse(await readJson(req))), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
