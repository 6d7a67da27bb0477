// GET /api/workshop/hours: the attended hours, whether open now and the next opening (anyone signed in).
// PUT /api/workshop/hours: replace the week's opening hours (admins only).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { attendedHoursView, setAttendedHours } from "@/lib/server/hours";
import { requireUser } from "@/lib/server/session";
import { attendedHoursInput } from "@/lib/validation/hours";
import { assertSameOrigin } from "@/lib/server/origin";

export async function GET() {
  try {
    await requireUser("printers:view");
    return NextResponse.json(await attendedHoursView());
  } catch (e) {
    return errorResponse(e);
  }
}

export async function PUT(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("hours:edit");
    const input = attendedHoursInput.parse(await readJson(req));
    return NextResponse.json(await setAttendedHours(user, input));
  } catch (e) {
    return errorResponse(e);
  }
}
