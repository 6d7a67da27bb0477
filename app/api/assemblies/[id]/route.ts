// GET /api/assemblies/[id]: the assembly's tree, parts, items, progress and blockers. PATCH: edit it. DELETE: owner removes it.
import { NextResponse } from "next/server";
import { deleteAssembly, parseId, requireEdit, updateAssembly } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { getAssemblyDetail } from "@/lib/server/parts";
import { requireUser } from "@/lib/server/session";
import { assemblyPatch } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ id: string }> };

export async function GET(_req: Request, ctx: Ctx) {
  try {
    const user = await requireUser();
    return NextResponse.json(await getAssemblyDetail(user, parseId((await ctx.params).id)));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function PATCH(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).id);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requireEdit(user, id);
    return NextResponse.json(await updateAssembly(user, id, assemblyPatch.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function DELETE(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    await deleteAssembly(user, parseId((await ctx.params).id));
    return new NextResponse(null, { status: 204 });
  } catch (e) {
    return errorResponse(e);
  }
}
