// GET /api/mail/preferences: which optional messages I get. PUT: change them (any signed-in person, own only).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { getMyPreferences, updateMyPreferences } from "@/lib/server/mail/preferences";
import { requireUser } from "@/lib/server/session";
import { preferencesInput } from "@/lib/validation/mail";
import { assertSameOrigin } from "@/lib/server/origin";

export async function GET() {
  try {
    const user = await requireUser("account:messages");
    return NextResponse.json(await getMyPreferences(user));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function PUT(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("account:messages");
    const input = preferencesInput.parse(await readJson(req));
    return NextResponse.json(await updateMyPreferences(user, input));
  } catch (e) {
    return errorResponse(e);
  }
}
