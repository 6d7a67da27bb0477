// GET /api/parts/[partId]/split: the part's pieces or parent. POST: accept a split; the server re-cuts the stored mesh and creates the pieces as parts.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { requirePartEdit } from "@/lib/server/parts";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { acceptSplit, getSplitLinks } from "@/lib/server/split";
import { splitAcceptInput } from "@/lib/validation/orientation";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ partId: string }> };

export async function GET(_req: Request, ctx: Ctx) {
  try {
    const user = await requireUser();
    return NextResponse.json(await getSplitLinks(user, parseId((await ctx.params).partId)));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function POST(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).partId);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requirePartEdit(user, id);
    return NextResponse.json(await acceptSplit(user, id, splitAcceptInput.parse(await readJson(req))), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
