export default function Loading() {
  return (
    <div role="status" className="text-sm text-ink-soft">
      Loading opening hours…
    </div>
  );
}
