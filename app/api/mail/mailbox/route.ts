// GET /api/mail/mailbox?to=: messages the local fake SMTP server received (admins; 404 unless MAIL_MODE=fake).
import { NextResponse } from "next/server";
import { z } from "zod";
import { errorResponse } from "@/lib/server/errors";
import { listMailbox } from "@/lib/server/mail/mailbox";
import { requireUser } from "@/lib/server/session";

const query = z.strictObject({ to: z.string().trim().email().max(254).optional() });

export async function GET(req: Request) {
  try {
    const user = await requireUser("mail:admin");
    const { to } = query.parse(Object.fromEntries(new URL(req.url).searchParams));
    return NextResponse.json(await listMailbox(user, { to }));
  } catch (e) {
    return errorResponse(e);
  }
}
