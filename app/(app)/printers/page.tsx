import type { Metadata } from "next";
import Link from "next/link";
import { PrinterBoard } from "@/components/printers/printer-board";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/permissions";
import { listPrinters } from "@/lib/server/printers";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";

export const metadata: Metadata = { title: "Printers" };

export default async function PrintersPage() {
  const user = await requirePageUser("printers:view", "/printers");
  const [printers, settings] = await Promise.all([listPrinters(user), getWorkshopSettings()]);
  // Dates cross to the client as ISO strings, as the API sends them.
  const initial = printers.map((p) => ({ ...p, expectedBackAt: p.expectedBackAt?.toISOString() ?? null }));
  return (
    <>
      <PageHeader
        title="Printers"
        lead="Each printer's bed, materials, rate and state, and how far its finished plates correct the estimates."
        actions={
          <Link href="/printers/quote" className="text-sm text-accent-ink underline">
            Quote a part
          </Link>
        }
      />
      <div className="mb-6">
        <Notice tone="warn" title="Hot nozzle and bed, moving parts">
          Keep hands clear while a printer runs and let the bed cool before taking a plate off. Follow the workshop&apos;s house rules and local codes.
        </Notice>
      </div>
      <PrinterBoard
        initial={initial}
        currency={settings.currency}
        timezone={settings.timezone}
        canManage={can(user.role, "printers:manage")}
        canSetState={can(user.role, "printers:set-state")}
      />
    </>
  );
}
