import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { PartView } from "@/components/bench/part-view";
import { PartPlanner } from "@/components/orient/part-planner";
import { PartQuote } from "@/components/quote/part-quote";
import type { PartDetailWire } from "@/lib/queries/parts";
import { AppError } from "@/lib/server/errors";
import { getPartDetail } from "@/lib/server/parts";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Part" };

// Members see their own and shared parts; operators and admins read every part.
export default async function PartPage({ params }: { params: Promise<{ partId: string }> }) {
  const { partId: raw } = await params;
  const user = await requirePageUser(undefined, `/bench/parts/${raw}`);
  const id = Number(raw);
  if (!Number.isSafeInteger(id) || id <= 0) notFound();
  let detail;
  try {
    detail = await getPartDetail(user, id);
  } catch (e) {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  }
  return (
    <>
      <PartView id={id} initial={JSON.parse(JSON.stringify(detail)) as PartDetailWire} />
      <PartQuote analysis={detail.current?.analysis} part={detail.part} placed={detail.placed} />
      <PartPlanner
        partId={id}
        fileId={detail.current?.id ?? null}
        units={detail.current?.units ?? "mm"}
        layerHeight={detail.part.layerHeightMm}
        material={detail.part.material}
        canEdit={detail.canEdit && detail.access !== "workshop"}
        beds={detail.beds.map((b) => ({ id: b.id, name: b.name, bedX: b.bedX, bedY: b.bedY, height: b.height, materials: b.materials }))}
      />
    </>
  );
}
