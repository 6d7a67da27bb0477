// GET /api/insights/[chart]?period…&format=json|csv: one chart's table, as JSON or a CSV download (operators and admins; money for admins only).
import { NextResponse } from "next/server";
import { toCsv } from "@/lib/insights/csv";
import { chartTable } from "@/lib/insights/tables";
import { AppError, errorResponse } from "@/lib/server/errors";
import { getInsights } from "@/lib/server/insights";
import { requireUser } from "@/lib/server/session";
import { insightCharts, insightsQuery, searchToObject, type InsightChart } from "@/lib/validation/insights";

export async function GET(req: Request, ctx: { params: Promise<{ chart: string }> }) {
  try {
    const user = await requireUser("insights:view");
    const chart = (await ctx.params).chart;
    if (!(insightCharts as readonly string[]).includes(chart)) throw new AppError("not_found", `There is no chart called ${chart}.`);
    const q = insightsQuery.parse(searchToObject(new URL(req.url).searchParams));
    const data = await getInsights(user, q);
    const table = chartTable(data, chart as InsightChart);
    if (q.format === "json") return NextResponse.json({ period: data.period, ...table }, { headers: { "cache-control": "no-store" } });
    return new Response(toCsv(table), {
      headers: {
        "content-type": "text/csv; charset=utf-8; header=present",
        "content-disposition": `attachment; filename="platewright-${chart}-${data.period.from}-to-${data.period.to}.csv"`,
        "cache-control": "no-store",
      },
    });
  } catch (e) {
    return errorResponse(e);
  }
}
