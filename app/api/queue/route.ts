// POST /api/queue: a member sends copies of a part to the workshop. GET: the waiting list (operators, admins).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { listWaiting, sendToQueue } from "@/lib/server/queue";
import { requireUser } from "@/lib/server/session";
import { queueSendInput } from "@/lib/validation/queue";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("queue:send");
    return NextResponse.json(await sendToQueue(user, queueSendInput.parse(await readJson(req))), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}

export async function GET() {
  try {
    const user = await requireUser("queue:manage");
    return NextResponse.json(await listWaiting(user));
  } catch (e) {
    return errorResponse(e);
  }
}
