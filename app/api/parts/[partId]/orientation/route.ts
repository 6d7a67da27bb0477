// GET /api/parts/[partId]/orientation: the chosen orientation for the current file and the server's suggestion. PUT: store the member's pick.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { requirePartEdit } from "@/lib/server/parts";
import { errorResponse, readJson } from "@/lib/server/errors";
import { chooseOrientation, getOrientation } from "@/lib/server/orientation";
import { requireUser } from "@/lib/server/session";
import { orientationPickInput } from "@/lib/validation/orientation";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ partId: string }> };

export async function GET(_req: Request, ctx: Ctx) {
  try {
    const user = await requireUser();
    return NextResponse.json(await getOrientation(user, parseId((await ctx.params).partId)));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function PUT(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).partId);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requirePartEdit(user, id);
    return NextResponse.json(await chooseOrientation(user, id, orientationPickInput.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}
