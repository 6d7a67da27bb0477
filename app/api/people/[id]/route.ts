// PATCH /api/people/:id: change another person's role or deactivate/reactivate them (admins; never oneself).
import { NextResponse } from "next/server";
import { z } from "zod";
import { errorResponse, readJson } from "@/lib/server/errors";
import { updatePerson } from "@/lib/server/invitations";
import { requireUser } from "@/lib/server/session";
import { personUpdateInput } from "@/lib/validation/mail";
import { assertSameOrigin } from "@/lib/server/origin";

export async function PATCH(req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    assertSameOrigin(req);
    const user = await requireUser("people:manage");
    const id = z.coerce.number().int().positive().parse((await ctx.params).id);
    const input = personUpdateInput.parse(await readJson(req));
    return NextResponse.json(await updatePerson(user, id, input));
  } catch (e) {
    return errorResponse(e);
  }
}
