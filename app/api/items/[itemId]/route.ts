// PATCH /api/items/[itemId]: change a hardware or made-elsewhere item (status, quantity…). DELETE: remove it.
import { NextResponse } from "next/server";
import { deleteItem, itemAssembly, parseId, requireEdit, updateItem } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { itemPatch } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ itemId: string }> };

export async function PATCH(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).itemId);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requireEdit(user, await itemAssembly(id));
    return NextResponse.json(await updateItem(user, id, itemPatch.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function DELETE(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    await deleteItem(user, parseId((await ctx.params).itemId));
    return new NextResponse(null, { status: 204 });
  } catch (e) {
    return errorResponse(e);
  }
}
