import type { Metadata } from "next";
import { HoursForm } from "@/components/printers/hours-form";
import { PageHeader } from "@/components/ui/page-header";
import { attendedHoursView } from "@/lib/server/hours";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Opening hours" };

export default async function HoursPage() {
  await requirePageUser("hours:edit", "/workshop/hours");
  const view = await attendedHoursView();
  return (
    <>
      <PageHeader title="Opening hours" lead="When someone is in the workshop to start a plate or take one off the bed. The planner starts and ends plates only in these hours." />
      <HoursForm initial={view} />
    </>
  );
}
