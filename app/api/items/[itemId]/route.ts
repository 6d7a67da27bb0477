// PATCH /api/items/[itemId]: change a hardware or made-elsewhere item (status, quantity…). DELETE: remove it.
import { NextResponse } from "next/server";
import { deleteItem, parseId, updateItem } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { itemPatch } from "@/lib/validation/assemblies";

type Ctx = { params: Promise<{ itemId: string }> };

export async function PATCH(req: Request, ctx: Ctx) {
  try {
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).itemId);
    return NextResponse.json(await updateItem(user, id, itemPatch.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function DELETE(_req: Request, ctx: Ctx) {
  try {
    const user = await requireUser("bench:use");
    await deleteItem(user, parseId((await ctx.params).itemId));
    return new NextResponse(null, { status: 204 });
  } catch (e) {
    return errorResponse(e);
  }
}
