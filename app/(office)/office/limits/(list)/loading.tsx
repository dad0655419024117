export default function LimitsLoading() {
  return (
    <div className="flex flex-col gap-3" aria-busy="true">
      <div className="h-8 w-40 animate-pulse rounded bg-line" />
      {Array.from({ length: 4 }, (_, i) => (
        <div key={i} className="h-16 animate-pulse rounded-lg bg-line/60" />
      ))}
      <p className="sr-only">Loading limits…</p>
    </div>
  );
}
