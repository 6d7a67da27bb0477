// POST /api/plan: re-plan every plate not yet started from the queue (operators, admins); serialised on the server.
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { replan } from "@/lib/server/queue";
import { requireUser } from "@/lib/server/session";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("queue:manage");
    return NextResponse.json(await replan(user));
  } catch (e) {
    return errorResponse(e);
  }
}
