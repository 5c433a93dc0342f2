/** Shown while a page's data loads. */
export function Loading({ label = "Loading…" }: { label?: string }) {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 py-10 text-slate-600">
      <span
        aria-hidden
        className="inline-block h-5 w-5 animate-spin rounded-full border-2 border-copper-500 border-t-transparent"
      />
      {label}
    </div>
  );
}
