// GET /api/files/[fileId]: download a stored mesh version, only for those who may read its part.
// ?source=1: the file as uploaded when the mesh was made from it (a STEP file).
import { NextResponse } from "next/server";
import { z } from "zod";
import { parseId } from "@/lib/server/assemblies";
import { errorResponse } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { openPartFile } from "@/lib/server/uploads";

const query = z.strictObject({ source: z.enum(["0", "1"]).optional() });

export async function GET(req: Request, ctx: { params: Promise<{ fileId: string }> }) {
  try {
    const user = await requireUser();
    const q = query.parse(Object.fromEntries(new URL(req.url).searchParams));
    const f = await openPartFile(user, parseId((await ctx.params).fileId), { source: q.source === "1" });
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
