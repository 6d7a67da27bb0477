// PATCH /api/materials/[id]: change a material or its price (admins only; version-guarded).
// DELETE /api/materials/[id]: remove a material without spools (admins only).
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { deleteMaterial, updateMaterial } from "@/lib/server/materials";
import { parseId } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";
import { materialUpdateInput } from "@/lib/validation/materials";
import { assertSameOrigin } from "@/lib/server/origin";

type Ctx = { params: Promise<{ id: string }> };

export async function PATCH(req: Request, { params }: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("materials:manage");
    const id = parseId((await params).id);
    const input = materialUpdateInput.parse(await readJson(req));
    return NextResponse.json(await updateMaterial(user, id, input));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function DELETE(req: Request, { params }: Ctx) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("materials:manage");
    await deleteMaterial(user, parseId((await params).id));
    return new NextResponse(null, { status: 204 });
  } catch (e) {
    return errorResponse(e);
  }
}
