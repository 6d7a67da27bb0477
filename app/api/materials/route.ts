// GET /api/materials: materials with spools in stock, low-stock flags and cautions (operators and admins).
// POST /api/materials: add a material with its density, source and price (admins only).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { createMaterial, listMaterials } from "@/lib/server/materials";
import { requireUser } from "@/lib/server/session";
import { materialInput } from "@/lib/validation/materials";
import { assertSameOrigin } from "@/lib/server/origin";

export async function GET() {
  try {
    const user = await requireUser("materials:view");
    return NextResponse.json(await listMaterials(user));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("materials:manage");
    const input = materialInput.parse(await readJson(req));
    return NextResponse.json(await createMaterial(user, input), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
