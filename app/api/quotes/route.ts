// POST /api/quotes: price one part (geometry + print settings) on every printer that takes its material (anyone signed in).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { quotePart } from "@/lib/server/quotes";
import { requireUser } from "@/lib/server/session";
import { quotePartInput } from "@/lib/validation/printers";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("quotes:request");
    const input = quotePartInput.parse(await readJson(req));
    return NextResponse.json(await quotePart(user, input));
  } catch (e) {
    return errorResponse(e);
  }
}
