// POST /api/webhooks/payments: the payment provider's signed events; marks checkouts paid (public, signature checked, replays harmless).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { handleWebhook } from "@/lib/server/payments";

export async function POST(req: Request) {
  try {
    // The signature covers the exact bytes, so read the raw text before any parsing.
    const raw = await req.text();
    const result = await handleWebhook(raw, req.headers.get("stripe-signature"));
    return NextResponse.json({ received: true, ...result });
  } catch (e) {
    return errorResponse(e);
  }
}
