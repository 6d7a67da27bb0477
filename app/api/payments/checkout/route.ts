// POST /api/payments/checkout: start a checkout for the member's whole balance; answers the page to go to (members).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { createCheckout } from "@/lib/server/payments";
import { requireUser } from "@/lib/server/session";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("ledger:own");
    const { url } = await createCheckout(user);
    return NextResponse.json({ url }, { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
