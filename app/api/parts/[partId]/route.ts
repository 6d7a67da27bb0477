// GET /api/parts/[partId]: the part with its copies, history, analysis and printer fit. PATCH: edit it. DELETE: remove it.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { deletePart, getPartDetail, requirePartEdit, updatePart } from "@/lib/server/parts";
import { requireUser } from "@/lib/server/session";
import { partPatch } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ partId: string }> };

export async function GET(_req: Request, ctx: Ctx) {
  try {
    const user = await requireUser();
    return NextResponse.json(await getPartDetail(user, parseId((await ctx.params).partId)));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function PATCH(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).partId);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requirePartEdit(user, id);
    return NextResponse.json(await updatePart(user, id, partPatch.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function DELETE(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    await deletePart(user, parseId((await ctx.params).partId));
    return new NextResponse(null, { status: 204 });
  } catch (e) {
    return errorResponse(e);
  }
}
