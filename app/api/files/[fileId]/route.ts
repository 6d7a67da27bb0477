// GET /api/files/[fileId]: download a stored mesh version, only for those who may read its part.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { errorResponse } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { openPartFile } from "@/lib/server/uploads";

export async function GET(_req: Request, ctx: { params: Promise<{ fileId: string }> }) {
  try {
    const user = await requireUser();
    const f = await openPartFile(user, parseId((await ctx.params).fileId));
    const safeName = f.name.replace(/[^\w.\- ]+/g, "_");
    return new NextResponse(f.stream, {
      headers: {
        "content-type": "application/octet-stream",
        "content-length": String(f.size),
        "content-disposition": `attachment; filename="${safeName}"`,
        "x-content-type-options": "nosniff",
        "cache-control": "private, max-age=3600",
      },
    });
  } catch (e) {
    return errorResponse(e);
  }
}
