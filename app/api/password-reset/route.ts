// POST /api/password-reset: e-mail a reset link if the address has an account (public; same answer either way).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requestPasswordReset } from "@/lib/server/password-reset";
import { resetRequestInput } from "@/lib/validation/mail";

export async function POST(req: Request) {
  try {
    const { email } = resetRequestInput.parse(await readJson(req));
    await requestPasswordReset(email);
    return NextResponse.json({ ok: true }, { status: 202 });
  } catch (e) {
    return errorResponse(e);
  }
}
