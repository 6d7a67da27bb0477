// GET /api/printers: every printer with state, loaded spool and calibration (anyone signed in).
// POST /api/printers: add a printer (admins only).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { createPrinter, listPrinters } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { printerInput } from "@/lib/validation/printers";
import { assertSameOrigin } from "@/lib/server/origin";

export async function GET() {
  try {
    const user = await requireUser("printers:view");
    return NextResponse.json(await listPrinters(user));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("printers:manage");
    const input = printerInput.parse(await readJson(req));
    return NextResponse.json(await createPrinter(user, input), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
