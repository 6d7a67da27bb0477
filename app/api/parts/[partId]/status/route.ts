// POST /api/parts/[partId]/status: move one copy of a part to another status (rules in lib/status), recorded with who, when and why.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { changeStatus, partAccess } from "@/lib/server/parts";
import { requireUser } from "@/lib/server/session";
import { statusChangeInput } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request, ctx: { params: Promise<{ partId: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser();
    const id = parseId((await ctx.params).partId);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await partAccess(user, id);
    return NextResponse.json(await changeStatus(user, id, statusChangeInput.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}
