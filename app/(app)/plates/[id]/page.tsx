import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { PlateView } from "@/components/plates/plate-view";
import { UNATTENDED_CAUTION } from "@/lib/plan/plan";
import type { PlateDetailWire } from "@/lib/queries/plates";
import { AppError } from "@/lib/server/errors";
import { plateDetail } from "@/lib/server/plate-export";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";

export const metadata: Metadata = { title: "Plate" };

export default async function PlatePage({ params }: { params: Promise<{ id: string }> }) {
  const { id: raw } = await params;
  const user = await requirePageUser("plates:view", `/plates/${raw}`);
  const id = Number(raw);
  if (!Number.isSafeInteger(id) || id <= 0) notFound();
  const settings = await getWorkshopSettings();
  const detail = await plateDetail(user, id).catch((e: unknown) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  const caution = `${UNATTENDED_CAUTION}${settings.safetyNote ? ` Workshop rules: ${settings.safetyNote}` : ""}`;
  return <PlateView id={id} initial={JSON.parse(JSON.stringify(detail)) as PlateDetailWire} timezone={settings.timezone} caution={caution} />;
}
