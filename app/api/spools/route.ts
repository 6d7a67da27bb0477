// POST /api/spools: put a new spool into stock (operators and admins).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { createSpool } from "@/lib/server/materials";
import { requireUser } from "@/lib/server/session";
import { spoolInput } from "@/lib/validation/materials";
import { assertSameOrigin } from "@/lib/server/origin";

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("spools:manage");
    const input = spoolInput.parse(await readJson(req));
    return NextResponse.json(await createSpool(user, input), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
