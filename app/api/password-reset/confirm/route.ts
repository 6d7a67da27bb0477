// POST /api/password-reset/confirm: set a new password from a reset link (public, single use).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { confirmPasswordReset } from "@/lib/server/password-reset";
import { resetConfirmInput } from "@/lib/validation/mail";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const input = resetConfirmInput.parse(await readJson(req));
    return NextResponse.json(await confirmPasswordReset(input));
  } catch (e) {
    return errorResponse(e);
  }
}
