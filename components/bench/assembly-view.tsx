"use client";
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import type { ReactNode } from "react";
import { EmptyState, Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { assemblyQuery, type AssemblyDetailWire } from "@/lib/queries/assemblies";
import { ItemForm, PartForm, ShareForm, SubAssemblyForm } from "./assembly-forms";
import { FileDrop } from "./file-drop";
import { ItemsTable } from "./items-table";
import { ProgressBar } from "./progress-bar";
import { StatusSummary } from "./status-badge";

type Node = AssemblyDetailWire["nodes"][number];

function Tree({ nodes, parentId, rootId }: { nodes: Node[]; parentId: number | null; rootId: number }) {
  const here = nodes.filter((n) => n.parentId === parentId);
  if (!here.length) return null;
  return (
    <ul className={parentId === null ? "flex flex-col gap-2" : "ml-5 mt-2 flex flex-col gap-2 border-l border-rule pl-4"}>
      {here.map((n) => (
        <li key={n.id}>
          <div className="flex flex-col gap-1">
            {n.id === rootId ? <span className="text-sm font-medium">{n.name}</span> : <Link href={`/bench/assemblies/${n.id}`} className="text-sm font-medium text-accent-ink hover:underline">{n.name}</Link>}
            <ProgressBar value={n.done} max={n.needed} label={`${n.name}: parts accepted`} />
          </div>
          <Tree nodes={nodes} parentId={n.id} rootId={rootId} />
        </li>
      ))}
    </ul>
  );
}

function Blockers({ b, printers }: { b: AssemblyDetailWire["blockers"]; printers: number }) {
  const list: { label: string; names: { id: number; name: string }[]; href?: (id: number) => string }[] = [
    { label: "Failed prints waiting for a reprint", names: b.failed, href: (id: number) => `/bench/parts/${id}` },
    { label: "Parts with no mesh uploaded", names: b.notUploaded, href: (id: number) => `/bench/parts/${id}` },
    { label: "Parts that fit no printer", names: b.notFitting, href: (id: number) => `/bench/parts/${id}` },
    { label: "Hardware and outside parts not in hand", names: b.hardwareNotInHand },
  ].filter((x) => x.names.length);
  return (
    <section aria-labelledby="blockers-h" className="flex flex-col gap-2">
      <h2 id="blockers-h">What blocks it</h2>
      {printers === 0 ? <p className="text-xs text-ink-soft">No printers are set up in the workshop yet, so fit is not checked.</p> : null}
      {list.length === 0 ? (
        <Notice tone="ok" title="Nothing blocks this assembly right now." />
      ) : (
        <ul className="flex flex-col gap-2">
          {list.map((x) => (
            <li key={x.label}>
              <Notice tone="warn" title={`${x.label} (${x.names.length})`}>
                {x.names.map((n, i) => (
                  <span key={n.id}>
                    {i ? ", " : ""}
                    {x.href ? <Link className="underline" href={x.href(n.id)}>{n.name}</Link> : n.name}
                  </span>
                ))}
              </Notice>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

export function AssemblyView({ id, initial, defaults, completion }: { id: number; initial: AssemblyDetailWire; defaults: string; completion?: ReactNode }) {
  const q = useQuery({ ...assemblyQuery(id), initialData: initial });
  const d = q.data;
  const where = new Map(d.nodes.map((n) => [n.id, n.name]));
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-xs text-ink-soft">
        <Link href="/bench" className="hover:underline">Bench</Link>
        {d.trail.slice(0, -1).map((t) => (
          <span key={t.id}>
            {" / "}
            <Link href={`/bench/assemblies/${t.id}`} className="hover:underline">{t.name}</Link>
          </span>
        ))}
      </nav>
      <PageHeader
        title={d.assembly.name}
        lead={[d.assembly.description, d.assembly.targetDate ? `Target date ${d.assembly.targetDate}.` : "", d.access === "owner" ? "" : `Owned by ${d.assembly.ownerName}; shared with you to ${d.access === "edit" ? "edit" : "read"}.`].filter(Boolean).join(" ")}
        actions={<a href={`/api/assemblies/${id}/bom`} download className="rounded-md border border-rule bg-sheet px-3.5 py-2 text-sm font-medium hover:bg-paper">Export bill of materials (CSV)</a>}
      />
      {q.isError ? <Notice tone="fail" title="The latest changes could not be loaded.">{q.error.message}</Notice> : null}
      {completion ? <div className="mb-6">{completion}</div> : null}
      <div className="grid gap-8 lg:grid-cols-[1fr_22rem]">
        <div className="flex flex-col gap-8">
          <section aria-labelledby="tree-h" className="flex flex-col gap-2">
            <h2 id="tree-h">Progress</h2>
            <Tree nodes={d.nodes} parentId={null} rootId={id} />
          </section>
          <Blockers b={d.blockers} printers={d.printers} />
          <section aria-labelledby="parts-h" className="flex flex-col gap-2">
            <h2 id="parts-h">Printed parts</h2>
            {d.parts.length === 0 ? (
              <EmptyState title="No printed parts yet">{d.canEdit ? "Drop mesh files below or add a part by hand." : "The owner has not added any parts yet."}</EmptyState>
            ) : (
              <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
                <table className="w-full text-sm">
                  <thead className="border-b border-rule text-left text-xs text-ink-soft">
                    <tr><th className="px-3 py-2">Part</th><th className="px-3 py-2">In</th><th className="px-3 py-2 text-right">Qty</th><th className="px-3 py-2">Material</th><th className="px-3 py-2">Mesh</th><th className="px-3 py-2">Copies</th></tr>
                  </thead>
                  <tbody className="divide-y divide-rule">
                    {d.parts.map((p) => (
                      <tr key={p.id}>
                        <td className="px-3 py-2"><Link href={`/bench/parts/${p.id}`} className="font-medium text-accent-ink hover:underline">{p.name}</Link></td>
                        <td className="px-3 py-2 text-ink-soft">{where.get(p.assemblyId)}</td>
                        <td className="num px-3 py-2">{p.quantity}</td>
                        <td className="px-3 py-2">{p.material}{p.colour ? `, ${p.colour}` : ""}</td>
                        <td className="num px-3 py-2">{p.placed ? `${[p.placed.footprint[0], p.placed.footprint[1], p.placed.height].map((x) => (x ?? 0).toFixed(1)).join(" × ")} mm${p.placed.source === "chosen" ? " as printed" : ""}` : "not uploaded"}</td>
                        <td className="px-3 py-2">{p.splitInto ? <span className="text-ink-soft">Split into {p.splitInto} pieces (printed as the pieces)</span> : <StatusSummary statuses={p.statuses} />}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
            {d.canEdit ? <FileDrop target={{ kind: "new-parts", assemblyId: id }} /> : null}
          </section>
          <section aria-labelledby="items-h" className="flex flex-col gap-2">
            <h2 id="items-h">Hardware and outside parts</h2>
            <ItemsTable assemblyId={id} items={d.items} canEdit={d.canEdit} where={where} />
          </section>
        </div>
        <aside className="flex flex-col gap-4">
          {d.canEdit ? (
            <>
              <SubAssemblyForm parentId={id} />
              <PartForm assemblyId={id} defaults={defaults} />
              <ItemForm assemblyId={id} />
            </>
          ) : null}
          {d.access === "owner" ? (
            <>
              <ShareForm assemblyId={id} />
              {d.shares.length ? (
                <ul className="text-sm" aria-label="Shared with">
                  {d.shares.map((s) => <li key={s.userId}>{s.name} · {s.access}</li>)}
                </ul>
              ) : null}
            </>
          ) : null}
        </aside>
      </div>
    </>
  );
}
