// GET /api/ledger/balances: who owes what, per member (admins).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { balances } from "@/lib/server/ledger";
import { requireUser } from "@/lib/server/session";

export async function GET() {
  try {
    const user = await requireUser("ledger:admin");
    return NextResponse.json(await balances(user));
  } catch (e) {
    return errorResponse(e);
  }
}
