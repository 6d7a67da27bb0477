// GET /api/workshop/settings: the workshop's settings (operators and admins).
// PATCH /api/workshop/settings: change them (admins only), guarded by the version number.
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { getWorkshopSettings, updateWorkshopSettings } from "@/lib/server/workshop";
import { workshopSettingsInput } from "@/lib/validation/workshop";
import { assertSameOrigin } from "@/lib/server/origin";

export async function GET() {
  try {
    await requireUser("workshop:view");
    return NextResponse.json(await getWorkshopSettings());
  } catch (e) {
    return errorResponse(e);
  }
}

export async function PATCH(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("workshop:edit");
    const input = workshopSettingsInput.parse(await readJson(req));
    return NextResponse.json(await updateWorkshopSettings(user, input));
  } catch (e) {
    return errorResponse(e);
  }
}
