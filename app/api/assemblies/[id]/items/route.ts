// POST /api/assemblies/[id]/items: add bought hardware or a part made elsewhere (owner or edit share).
import { NextResponse } from "next/server";
import { createItem, parseId, requireEdit } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { itemInput } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).id);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requireEdit(user, id);
    return NextResponse.json(await createItem(user, id, itemInput.parse(await readJson(req))), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
