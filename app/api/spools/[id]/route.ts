// PATCH /api/spools/[id]: record a spool's weighed grams (operators and admins; version-guarded).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { setSpoolGrams } from "@/lib/server/materials";
import { parseId } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { spoolGramsInput } from "@/lib/validation/materials";
import { assertSameOrigin } from "@/lib/server/origin";

export async function PATCH(req: Request, { params }: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("spools:manage");
    const id = parseId((await params).id);
    await setSpoolGrams(user, id, spoolGramsInput.parse(await readJson(req)));
    return NextResponse.json({ ok: true });
  } catch (e) {
    return errorResponse(e);
  }
}
