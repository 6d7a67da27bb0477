import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";
import { SettingsForm } from "./settings-form";

export const metadata: Metadata = { title: "Workshop settings" };

export default async function WorkshopPage() {
  await requirePageUser("workshop:edit", "/workshop");
  const settings = await getWorkshopSettings();
  return (
    <>
      <PageHeader title="Workshop settings" lead="Your workshop's name, time zone, prices and the defaults new parts start from." />
      <SettingsForm initial={{ ...settings, updatedAt: settings.updatedAt.toISOString() }} />
    </>
  );
}
