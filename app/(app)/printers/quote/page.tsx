import type { Metadata } from "next";
import { QuoteForm } from "@/components/quote/quote-form";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";

export const metadata: Metadata = { title: "Quote a part" };

export default async function QuotePage() {
  await requirePageUser("quotes:request", "/printers/quote");
  const s = await getWorkshopSettings();
  return (
    <>
      <PageHeader title="Quote a part" lead="Material by weight plus machine time at each printer's rate, and the workshop's fee per plate." />
      <QuoteForm defaults={{ layerHeightMm: s.defaultLayerHeightMm, wallCount: s.defaultWalls, infillPercent: s.defaultInfillPercent }} />
    </>
  );
}
