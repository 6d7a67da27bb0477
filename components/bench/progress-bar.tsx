/** A labelled bar; the numbers are written beside it so colour is never the only signal. */
export function ProgressBar({ value, max, label, tone = "accent" }: { value: number; max: number; label: string; tone?: "accent" | "warn" | "fail" }) {
  const pct = max > 0 ? Math.min(100, Math.round((value / max) * 100)) : 0;
  const fill = tone === "fail" ? "bg-fail" : tone === "warn" ? "bg-warn" : "bg-accent";
  return (
    <div className="flex items-center gap-3">
      <div role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={max} aria-valuenow={value} className="h-2 flex-1 overflow-hidden rounded-full bg-rule/60">
        <div className={`h-full ${fill} transition-[width]`} style={{ width: `${pct}%` }} />
      </div>
      <span className="num min-w-16 text-xs text-ink-soft">{max > 0 ? `${value} of ${max}` : "none yet"}</span>
    </div>
  );
}
