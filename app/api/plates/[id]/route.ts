// GET /api/plates/[id]: a plate with its bed and items (staff; a member only when a copy of theirs is on it).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { plateDetail } from "@/lib/server/plate-export";
import { parseId } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";

export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireUser("plates:view");
    return NextResponse.json(await plateDetail(user, parseId((await ctx.params).id)));
  } catch (e) {
    return errorResponse(e);
  }
}
