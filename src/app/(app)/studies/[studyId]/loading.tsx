export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="animate-pulse space-y-3">
      <div className="h-7 w-64 rounded bg-rule" />
      <div className="h-4 w-full rounded bg-rule" />
      <div className="h-4 w-5/6 rounded bg-rule" />
      <span className="sr-only">Loading…</span>
    </div>
  );
}
