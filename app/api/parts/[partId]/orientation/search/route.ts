// POST /api/parts/[partId]/orientation/search: run the orientation search on the server and store the best as a suggestion.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { requirePartEdit } from "@/lib/server/parts";
import { errorResponse, readJson } from "@/lib/server/errors";
import { runOrientationSearch } from "@/lib/server/orientation";
import { requireUser } from "@/lib/server/session";
import { orientationSearchInput } from "@/lib/validation/orientation";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ partId: string }> };

export async function POST(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).partId);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requirePartEdit(user, id);
    const body = req.headers.get("content-type") ? await readJson(req) : {};
    return NextResponse.json(await runOrientationSearch(user, id, orientationSearchInput.parse(body)));
  } catch (e) {
    return errorResponse(e);
  }
}
