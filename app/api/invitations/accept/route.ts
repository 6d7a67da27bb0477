// POST /api/invitations/accept: set name and password from an invitation link and create the member (public, single use).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { acceptInvitation } from "@/lib/server/invitations";
import { acceptInviteInput } from "@/lib/validation/mail";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const input = acceptInviteInput.parse(await readJson(req));
    return NextResponse.json(await acceptInvitation(input), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
