// POST /api/printers/[id]/history: record a finished plate's actual minutes (and grams) for calibration; takes the grams off the loaded spool (operators and admins).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { parseId, recordFinishedPlate } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { finishedPlateInput } from "@/lib/validation/printers";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request, { params }: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("printers:set-state");
    const id = parseId((await params).id);
    const input = finishedPlateInput.parse(await readJson(req));
    return NextResponse.json(await recordFinishedPlate(user, id, input), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
