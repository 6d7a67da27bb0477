export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 py-16 text-sm text-ink-soft">
      <span className="h-4 w-4 animate-spin rounded-full border-2 border-rule border-t-accent" aria-hidden />
      Loading the plate…
    </div>
  );
}
