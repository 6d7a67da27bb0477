import type { Metadata } from "next";
import { EmptyState, Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";

export const metadata: Metadata = { title: "Floor" };

export default async function FloorPage() {
  await requirePageUser("floor:view", "/floor");
  const settings = await getWorkshopSettings();
  return (
    <>
      <PageHeader title="Floor" lead="The printers and the plates lined up for each." />
      <div className="flex flex-col gap-6">
        <Notice tone="warn" title="Hot surfaces, moving parts, fumes">
          {settings.safetyNote || "Follow the workshop's house rules and local codes."}
        </Notice>
        <section aria-labelledby="printers-h" className="flex flex-col gap-3">
          <h2 id="printers-h">Printers</h2>
          <EmptyState title="No printers yet">The workshop&apos;s printers and their state will appear here.</EmptyState>
        </section>
        <section aria-labelledby="queue-h" className="flex flex-col gap-3">
          <h2 id="queue-h">Queue</h2>
          <EmptyState title="The queue is empty">Parts that members send to the workshop wait here to be plated.</EmptyState>
        </section>
      </div>
    </>
  );
}
