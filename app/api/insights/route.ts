// GET /api/insights?period=week|month|custom&from&to: every insights chart's numbers for the period (operators and admins; money for admins only).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { getInsights } from "@/lib/server/insights";
import { requireUser } from "@/lib/server/session";
import { insightsQuery, searchToObject } from "@/lib/validation/insights";

export async function GET(req: Request) {
  try {
    const user = await requireUser("insights:view");
    const q = insightsQuery.parse(searchToObject(new URL(req.url).searchParams));
    return NextResponse.json(await getInsights(user, q), { headers: { "cache-control": "no-store" } });
  } catch (e) {
    return errorResponse(e);
  }
}
