// GET /api/mail/outbox: the newest outgoing messages and their delivery state (admins).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { listOutbox } from "@/lib/server/mail";
import { requireUser } from "@/lib/server/session";

export async function GET() {
  try {
    const user = await requireUser("mail:admin");
    return NextResponse.json(await listOutbox(user));
  } catch (e) {
    return errorResponse(e);
  }
}
