// GET/POST/DELETE /api/assemblies/[id]/shares: the owner lists, adds (read or edit) or removes (?userId=) members an assembly is shared with.
import { NextResponse } from "next/server";
import { listShares, parseId, requireEdit, shareAssembly, unshareAssembly } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { shareInput } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ id: string }> };

export async function GET(_req: Request, ctx: Ctx) {
  try {
    const user = await requireUser("bench:use");
    return NextResponse.json(await listShares(user, parseId((await ctx.params).id)));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function POST(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).id);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requireEdit(user, id);
    return NextResponse.json(await shareAssembly(user, id, shareInput.parse(await readJson(req))), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}

export async function DELETE(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).id);
    const target = parseId(new URL(req.url).searchParams.get("userId") ?? "");
    await unshareAssembly(user, id, target);
    return new NextResponse(null, { status: 204 });
  } catch (e) {
    return errorResponse(e);
  }
}
