export default function BoardLoading() {
  return (
    <div className="flex flex-col gap-3" aria-busy="true">
      <div className="h-8 w-60 animate-pulse rounded bg-line" />
      <div className="grid gap-2 md:grid-cols-7">
        {Array.from({ length: 7 }, (_, i) => (
          <div key={i} className="h-32 animate-pulse rounded-xl bg-line/60" />
        ))}
      </div>
      <p className="sr-only">Loading the board…</p>
    </div>
  );
}
