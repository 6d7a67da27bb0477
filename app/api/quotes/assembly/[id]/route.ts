// GET /api/quotes/assembly/[id]: the quote of a stored assembly from its parts' meshes and settings (anyone who may read the assembly).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { parseId } from "@/lib/server/printers";
import { quoteStoredAssembly } from "@/lib/server/quotes";
import { requireUser } from "@/lib/server/session";

export async function GET(_req: Request, { params }: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireUser("quotes:request");
    return NextResponse.json(await quoteStoredAssembly(user, parseId((await params).id)));
  } catch (e) {
    return errorResponse(e);
  }
}
