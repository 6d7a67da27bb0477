// POST /api/mail/outbox/:id/retry: put a failed message back in line (admins).
import { NextResponse } from "next/server";
import { z } from "zod";
import { errorResponse } from "@/lib/server/errors";
import { retryMessage } from "@/lib/server/mail";
import { requireUser } from "@/lib/server/session";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("mail:admin");
    const id = z.coerce.number().int().positive().parse((await ctx.params).id);
    await retryMessage(user, id);
    return NextResponse.json({ ok: true });
  } catch (e) {
    return errorResponse(e);
  }
}
