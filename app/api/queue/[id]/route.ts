// PATCH /api/queue/[id]: the workshop changes a queue entry's priority, guarded by its version.
import { NextResponse } from "next/server";
import { errorResponse, readJson } from "@/lib/server/errors";
import { parseId } from "@/lib/server/printers";
import { setPriority } from "@/lib/server/queue";
import { requireUser } from "@/lib/server/session";
import { queuePriorityInput } from "@/lib/validation/queue";
import { assertSameOrigin } from "@/lib/server/origin";

export async function PATCH(req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("queue:manage");
    const id = parseId((await ctx.params).id);
    return NextResponse.json(await setPriority(user, id, queuePriorityInput.parse(await readJson(req))));
  } catch (e) {
    return errorResponse(e);
  }
}
