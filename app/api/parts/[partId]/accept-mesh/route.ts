// POST /api/parts/[partId]/accept-mesh: an operator or admin accepts a mesh that is not a closed solid, saying why (recorded with the file).
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { assertSameOrigin } from "@/lib/server/origin";
import { acceptBrokenMesh } from "@/lib/server/mesh-health";
import { partAccess } from "@/lib/server/parts";
import { requireUser } from "@/lib/server/session";
import { meshAcceptInput } from "@/lib/validation/mesh-health";

type Ctx = { params: Promise<{ partId: string }> };

export async function POST(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("parts:accept-mesh");
    const id = parseId((await ctx.params).partId);
    await partAccess(user, id);
    return NextResponse.json(await acceptBrokenMesh(user, id, meshAcceptInput.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}
