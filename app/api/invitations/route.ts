// GET /api/invitations: recent invitations (admins). POST /api/invitations: invite a person by e-mail (admins).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { createInvitation, listInvitations } from "@/lib/server/invitations";
import { requireUser } from "@/lib/server/session";
import { inviteInput } from "@/lib/validation/mail";
import { assertSameOrigin } from "@/lib/server/origin";

export async function GET() {
  try {
    const user = await requireUser("people:manage");
    return NextResponse.json(await listInvitations(user));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("people:manage");
    const input = inviteInput.parse(await readJson(req));
    return NextResponse.json(await createInvitation(user, input), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
