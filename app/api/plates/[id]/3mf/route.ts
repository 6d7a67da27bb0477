// GET /api/plates/[id]/3mf: the plate as a 3MF file with every copy placed where the plan puts it (operators, admins).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { plate3mf } from "@/lib/server/plate-export";
import { parseId } from "@/lib/server/printers";
import { requireUser } from "@/lib/server/session";

export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireUser("plates:act");
    const f = await plate3mf(user, parseId((await ctx.params).id));
    return new NextResponse(Buffer.from(f.bytes), {
      headers: {
        "content-type": "application/vnd.ms-package.3dmanufacturing-3dmodel+xml",
        "content-disposition": `attachment; filename="${f.filename}"`,
        "x-content-type-options": "nosniff",
        "cache-control": "private, no-store",
      },
    });
  } catch (e) {
    return errorResponse(e);
  }
}
