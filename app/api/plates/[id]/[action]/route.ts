// POST /api/plates/[id]/(start|finish|fail|cancel|move): act on a plate (operators, admins); a stale version answers 409.
import { NextResponse } from "next/server";
import { AppError, errorResponse, readJson } from "@/lib/server/errors";
import { movePlate } from "@/lib/server/plate-move";
import { cancelPlate, failPlate, finishPlate, startPlate } from "@/lib/server/plates";
import { parseId } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { plateCancelInput, plateFailInput, plateFinishInput, plateMoveInput, plateStartInput } from "@/lib/validation/plates";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request, ctx: { params: Promise<{ id: string; action: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("plates:act");
    const { id: raw, action } = await ctx.params;
    const id = parseId(raw);
    const body = await readJson(req);
    switch (action) {
      case "start":
        return NextResponse.json(await startPlate(user, id, plateStartInput.parse(body)));
      case "finish":
        return NextResponse.json(await finishPlate(user, id, plateFinishInput.parse(body)));
      case "fail":
        return NextResponse.json(await failPlate(user, id, plateFailInput.parse(body)));
      case "cancel":
        return NextResponse.json(await cancelPlate(user, id, plateCancelInput.parse(body)));
      case "move":
        return NextResponse.json(await movePlate(user, id, plateMoveInput.parse(body)));
      default:
        throw new AppError("not_found", "There is no such plate action.");
    }
  } catch (e) {
    return errorResponse(e);
  }
}
