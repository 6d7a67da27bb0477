// PUT /api/parts/[partId]/file?name=…&units=mm|in: upload a new mesh version as the raw body (application/octet-stream).
import { NextResponse } from "next/server";
import { parseId } from "@/lib/server/assemblies";
import { requirePartEdit } from "@/lib/server/parts";
import { AppError, errorResponse } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";
import { receiveUpload } from "@/lib/server/uploads";
import { uploadQuery } from "@/lib/validation/assemblies";
import { assertSameOrigin } from "@/lib/server/origin";

export async function PUT(req: Request, ctx: { params: Promise<{ partId: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("bench:use");
    const id = parseId((await ctx.params).partId);
    // Who may change it is checked before the body is validated, so a caller who may not see it gets 404, not field errors.
    await requirePartEdit(user, id);
    const sp = new URL(req.url).searchParams;
    const q = uploadQuery.parse({ name: sp.get("name") ?? "", ...(sp.has("units") ? { units: sp.get("units") } : {}) });
    const type = (req.headers.get("content-type") ?? "").toLowerCase();
    if (!type.startsWith("application/octet-stream")) throw new AppError("bad_request", "Send the file as application/octet-stream.");
    const len = req.headers.get("content-length");
    const result = await receiveUpload(user, id, req.body, q, { declaredLength: len ? Number(len) : undefined });
    return NextResponse.json(result, { status: 201 });
  } catch (e) {
    return errorResponse(e);
  }
}
