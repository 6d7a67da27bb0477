import type { ReactNode } from "react";

type Tone = "info" | "warn" | "fail" | "ok";

const tones: Record<Tone, { box: string; icon: string; label: string }> = {
  info: { box: "border-rule bg-sheet text-ink", icon: "ⓘ", label: "Note" },
  warn: { box: "border-warn/40 bg-warn-wash text-ink", icon: "⚠", label: "Caution" },
  fail: { box: "border-fail/40 bg-fail-wash text-ink", icon: "✕", label: "Problem" },
  ok: { box: "border-accent/30 bg-accent-wash text-ink", icon: "✓", label: "Done" },
};

/** A boxed message; the icon and the hidden label mean colour is never the only signal. */
export function Notice({ tone = "info", title, children }: { tone?: Tone; title?: string; children?: ReactNode }) {
  const t = tones[tone];
  return (
    <div role={tone === "fail" ? "alert" : "status"} className={`flex gap-3 rounded-md border px-4 py-3 text-sm ${t.box}`}>
      <span aria-hidden className="select-none font-semibold">
        {t.icon}
      </span>
      <div>
        <span className="sr-only">{t.label}: </span>
        {title ? <p className="font-medium">{title}</p> : null}
        {children ? <div className="text-ink-soft">{children}</div> : null}
      </div>
    </div>
  );
}

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-rule bg-sheet/60 px-6 py-10 text-center">
      <p className="font-medium">{title}</p>
      {children ? <div className="mt-1 text-sm text-ink-soft">{children}</div> : null}
    </div>
  );
}
