// PUT /api/spools/[id]/load: load the spool on a printer ({ printerId }) or take it off ({ printerId: null }) (operators and admins).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { loadSpool } from "@/lib/server/materials";
import { parseId } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { spoolLoadInput } from "@/lib/validation/materials";
import { assertSameOrigin } from "@/lib/server/origin";

export async function PUT(req: Request, { params }: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("spools:manage");
    const id = parseId((await params).id);
    const { printerId } = spoolLoadInput.parse(await readJson(req));
    await loadSpool(user, id, printerId);
    return NextResponse.json({ ok: true });
  } catch (e) {
    return errorResponse(e);
  }
}
