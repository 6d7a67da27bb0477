// GET /api/ledger: the signed-in member's balance, charges and payments (members, own only).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { myLedger } from "@/lib/server/ledger";
import { requireUser } from "@/lib/server/session";

export async function GET() {
  try {
    const user = await requireUser("ledger:own");
    return NextResponse.json(await myLedger(user));
  } catch (e) {
    return errorResponse(e);
  }
}
