// POST /api/webhooks/payments: the payment provider's signed events; marks checkouts paid (public, signature checked, replays harmless).
import { NextResponse } from "next/server";
import { errorResponse, readBodyText } from "@/lib/server/errors";
import { handleWebhook } from "@/lib/server/payments";

export async function POST(req: Request) {
  try {
    // The signature covers the exact bytes, so read the raw text before any parsing; a public route, so
    // capped while reading (events are a few KB; 1 MB is far above any).
    const raw = await readBodyText(req, 1_000_000);
    const result = await handleWebhook(raw, req.headers.get("stripe-signature"));
    return NextResponse.json({ received: true, ...result });
  } catch (e) {
    return errorResponse(e);
  }
}
