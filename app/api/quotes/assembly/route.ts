// POST /api/quotes/assembly: price a whole assembly (parts with quantities), the fee once (anyone signed in).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { quoteAssemblyParts } from "@/lib/server/quotes";
import { requireUser } from "@/lib/server/session";
import { quoteAssemblyInput } from "@/lib/validation/printers";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("quotes:request");
    const input = quoteAssemblyInput.parse(await readJson(req));
    return NextResponse.json(await quoteAssemblyParts(user, input));
  } catch (e) {
    return errorResponse(e);
  }
}
