// GET /api/people: everyone with an account, their role and whether it is active (admins).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { listPeople } from "@/lib/server/invitations";
import { requireUser } from "@/lib/server/session";

export async function GET() {
  try {
    const user = await requireUser("people:manage");
    return NextResponse.json(await listPeople(user));
  } catch (e) {
    return errorResponse(e);
  }
}
