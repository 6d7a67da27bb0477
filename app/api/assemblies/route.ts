// GET /api/assemblies: my assemblies and those shared with me. POST: create one (or a sub-assembly with parentId).
import { NextResponse } from "next/server";
import { createAssembly, listMyAssemblies } from "@/lib/server/assemblies";
import { errorResponse, readJson } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { assemblyInput } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

export async function GET() {
  try {
    const user = await requireUser("bench:use");
    return NextResponse.json(await listMyAssemblies(user));
  } catch (e) {
    return errorResponse(e);
  }
}

export async function POST(req: Request) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const input = assemblyInput.parse(await readJson(req));
    return NextResponse.json(await createAssembly(user, input), { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
