// GET /api/queue/parts/[partId]: each copy's queue details, plate, expected finish and shelf label, for anyone who may read the part.
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { parseId } from "@/lib/server/printers";
import { partSchedule } from "@/lib/server/queue";
import { requireUser } from "@/lib/server/session";

export async function GET(_req: Request, ctx: { params: Promise<{ partId: string }> }) {
  try {
    const user = await requireUser();
    return NextResponse.json(await partSchedule(user, parseId((await ctx.params).partId)));
  } catch (e) {
    return errorResponse(e);
  }
}
