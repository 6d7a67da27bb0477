// PATCH /api/printers/[id]/state: set available, busy or under maintenance with a note and expected return (operators and admins).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { parseId, setPrinterState } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { printerStateInput } from "@/lib/validation/printers";
import { assertSameOrigin } from "@/lib/server/origin";

export async function PATCH(req: Request, { params }: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("printers:set-state");
    const id = parseId((await params).id);
    const input = printerStateInput.parse(await readJson(req));
    return NextResponse.json(await setPrinterState(user, id, input));
  } catch (e) {
    return errorResponse(e);
  }
}
