// GET /api/printers/[id]: one printer (anyone signed in).
// PATCH /api/printers/[id]: change everything, the hourly rate included (admins only; version-guarded).
// DELETE /api/printers/[id]: remove a printer (admins only).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { deletePrinter, getPrinter, parseId, updatePrinter } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { printerUpdateInput } from "@/lib/validation/printers";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ id: string }> };

export async function GET(_req: Request, { params }: Ctx) {
  try {
    const user = await requireUser("printers:view");
    return NextResponse.json(await getPrinter(user, parseId((await params).id)));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function PATCH(req: Request, { params }: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("printers:manage");
    const id = parseId((await params).id);
    const input = printerUpdateInput.parse(await readJson(req));
    return NextResponse.json(await updatePrinter(user, id, input));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function DELETE(req: Request, { params }: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("printers:manage");
    await deletePrinter(user, parseId((await params).id));
    return new NextResponse(null, { status: 204 });
  } catch (e) {
    return errorResponse(e);
  }
}
