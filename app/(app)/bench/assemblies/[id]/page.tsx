import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AssemblyView } from "@/components/bench/assembly-view";
import { CompletionNote } from "@/components/bench/completion-note";
import { AssemblyQuotePanel } from "@/components/quote/assembly-quote-panel";
import type { AssemblyDetailWire } from "@/lib/queries/assemblies";
import { assemblyCompletion } from "@/lib/server/assembly-completion";
import { AppError } from "@/lib/server/errors";
import { getAssemblyDetail } from "@/lib/server/parts";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";

export const metadata: Metadata = { title: "Assembly" };

export default async function AssemblyPage({ params }: { params: Promise<{ id: string }> }) {
  const { id: raw } = await params;
  const user = await requirePageUser(undefined, `/bench/assemblies/${raw}`);
  const id = Number(raw);
  if (!Number.isSafeInteger(id) || id <= 0) notFound();
  let detail;
  try {
    detail = await getAssemblyDetail(user, id);
  } catch (e) {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  }
  const [w, completion] = await Promise.all([getWorkshopSettings(), assemblyCompletion(user, id)]);
  const defaults = `Empty fields take the workshop's defaults: ${w.defaultLayerHeightMm} mm layers, ${w.defaultWalls} walls, ${w.defaultInfillPercent} % infill.`;
  return (
    <>
      <AssemblyView id={id} initial={JSON.parse(JSON.stringify(detail)) as AssemblyDetailWire} defaults={defaults} completion={<CompletionNote c={completion} timezone={w.timezone} />} />
      <AssemblyQuotePanel assemblyId={id} />
    </>
  );
}
