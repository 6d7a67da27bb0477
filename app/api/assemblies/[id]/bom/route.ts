// GET /api/assemblies/[id]/bom: the bill of materials of the assembly and its sub-assemblies, as a CSV download.
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { errorResponse } from "@/lib/server/errors";
import { bomCsv } from "@/lib/server/parts";
import { requireUser } from "@/lib/server/session";

export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireUser();
    const { filename, csv } = await bomCsv(user, parseId((await ctx.params).id));
    return new NextResponse(csv, {
      headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${filename}"`, "cache-control": "no-store" },
    });
  } catch (e) {
    return errorResponse(e);
  }
}
