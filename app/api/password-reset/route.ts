// POST /api/password-reset: e-mail a reset link if the address has an account (public; same answer either way).
import { after, NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requestPasswordReset } from "@/lib/server/password-reset";
import { resetRequestInput } from "@/lib/validation/mail";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const { email } = resetRequestInput.parse(await readJson(req));
    // The look-up and the message are made after the answer has gone, so the answer takes the same
    // time whether the address has an account or not.
    after(() => requestPasswordReset(email).catch((e: unknown) => console.error("[platewright] password reset request:", e)));
    return NextResponse.json({ ok: true }, { status: 202 });
  } catch (e) {
    return errorResponse(e);
  }
}
