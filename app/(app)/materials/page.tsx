import type { Metadata } from "next";
import { StockBoard } from "@/components/printers/stock-board";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/permissions";
import { listMaterials } from "@/lib/server/materials";
import { listPrinters } from "@/lib/server/printers";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";

export const metadata: Metadata = { title: "Materials" };

export default async function MaterialsPage() {
  const user = await requirePageUser("materials:view", "/materials");
  const [materials, printers, settings] = await Promise.all([listMaterials(user), listPrinters(user), getWorkshopSettings()]);
  const iso = <T extends { loadedAt: Date | null }>(s: T) => ({ ...s, loadedAt: s.loadedAt?.toISOString() ?? null });
  return (
    <>
      <PageHeader title="Materials" lead="Prices, densities and where they come from, spools in stock and which printer each is loaded on." />
      <StockBoard
        initial={materials.map((m) => ({ ...m, spools: m.spools.map(iso) }))}
        printers={printers.map((p) => ({ ...p, expectedBackAt: p.expectedBackAt?.toISOString() ?? null }))}
        currency={settings.currency}
        canManage={can(user.role, "materials:manage")}
        canSpools={can(user.role, "spools:manage")}
      />
    </>
  );
}
