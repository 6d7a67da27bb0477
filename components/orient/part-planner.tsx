"use client";
// The planner on the part page: the orientation in use, the split links, and (for those who may
// edit the part) the orientation search and the split planner.
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { Notice } from "@/components/ui/notice";
import { orientationQuery, splitLinksQuery, IDENTITY_QUAT, type OrientationWire } from "@/lib/queries/orientation";
import { downLabel, mm, type BedInfo } from "./format";
import { OrientationPanel } from "./orientation-panel";
import { SplitPanel } from "./split-panel";

export interface PartPlannerProps {
  partId: number;
  fileId: number | null;
  units: "mm" | "in";
  layerHeight: number;
  material: string;
  canEdit: boolean;
  beds: BedInfo[];
}

function InUse({ o }: { o: OrientationWire }) {
  const c = o.chosen;
  if (!c || c.summary.source === "original") {
    return <p className="text-sm" data-testid="orientation-in-use">In use: the file&apos;s own orientation{c?.chosenBy ? `, kept by ${c.chosenBy}` : ""}.</p>;
  }
  return (
    <p className="text-sm" data-testid="orientation-in-use">
      In use: {c.summary.label ? <strong>{c.summary.label}</strong> : null}{c.summary.label ? " · " : ""}chosen by {c.chosenBy ?? "someone"}{c.chosenAt ? ` on ${new Date(c.chosenAt).toLocaleDateString("en-GB")}` : ""} · {downLabel(c.down)} · {mm(c.height)} mm high ({c.summary.layers} layers) · {mm(c.footprint[0] ?? 0)} × {mm(c.footprint[1] ?? 0)} mm on the bed
      {c.summary.supportVolume !== undefined ? ` · about ${mm(c.summary.supportVolume, 0)} mm³ of support` : ""}.
    </p>
  );
}

export function PartPlanner(props: PartPlannerProps) {
  const o = useQuery(orientationQuery(props.partId));
  const links = useQuery(splitLinksQuery(props.partId));
  const l = links.data;
  // The page's props may predate a new upload; the orientation query names the current file.
  const fileId = o.data ? o.data.fileId : props.fileId;
  return (
    <section aria-labelledby="planner-h" className="mt-8 flex flex-col gap-6 rounded-lg border border-rule p-4">
      <h2 id="planner-h" className="sr-only">Orientation and split</h2>
      {l?.parent ? <p className="text-sm">Cut from <Link className="underline" href={`/bench/parts/${l.parent.id}`}>{l.parent.name}</Link>: glue the cut faces together.</p> : null}
      {l && l.pieces.length > 0 ? (
        <Notice tone="info" title={`Split into ${l.pieces.length} pieces`}>
          <p>This part is printed as its pieces; it no longer goes to the workshop itself.</p>
          <ul aria-label="Pieces">{l.pieces.map((x) => <li key={x.id}><Link className="underline" href={`/bench/parts/${x.id}`}>{x.name}</Link></li>)}</ul>
        </Notice>
      ) : null}
      {o.isPending ? <p role="status" className="text-sm text-ink-soft">Loading the orientation…</p> : o.isError ? <Notice tone="fail" title="The orientation could not be loaded.">{o.error.message}</Notice> : <InUse o={o.data} />}
      {fileId === null ? <p className="text-sm text-ink-soft">Upload a mesh to plan its orientation.</p> : null}
      {fileId !== null && props.canEdit && l && l.pieces.length === 0 && o.data ? (
        <>
          <OrientationPanel p={{ ...props, fileId }} />
          <SplitPanel key={o.data.chosen?.quaternion.join(",") ?? "file"} p={{ ...props, fileId }} quaternion={(o.data.chosen?.quaternion as [number, number, number, number] | undefined) ?? IDENTITY_QUAT} />
        </>
      ) : null}
    </section>
  );
}
