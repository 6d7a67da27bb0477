import type { Metadata } from "next";
import { InsightsView } from "@/components/insights/insights-view";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { getInsights } from "@/lib/server/insights";
import { requirePageUser } from "@/lib/server/session";
import { insightsQuery } from "@/lib/validation/insights";

export const metadata: Metadata = { title: "Insights" };
export const dynamic = "force-dynamic";

export default async function InsightsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePageUser("insights:view", "/insights");
  const raw = await searchParams;
  const one = (k: string) => (typeof raw[k] === "string" && raw[k] !== "" ? (raw[k] as string) : undefined);
  const parsed = insightsQuery.safeParse({ period: one("period"), from: one("from"), to: one("to") });
  // A bad address falls back to this month and says why, rather than failing the page.
  const q = parsed.success ? parsed.data : insightsQuery.parse({});
  const params = { period: q.period, from: q.from, to: q.to };
  const initial = await getInsights(user, params);
  return (
    <>
      <PageHeader title="Insights" lead="How the printers spent their time, what failed, how estimates held up, material and members, for the period you choose. Every chart has its table and a CSV." />
      {parsed.success ? null : (
        <div className="mb-6">
          <Notice tone="warn" title="That period could not be read; showing this month.">{parsed.error.issues.map((i) => i.message).join(" ")}</Notice>
        </div>
      )}
      <InsightsView initial={initial} initialParams={params} />
    </>
  );
}
