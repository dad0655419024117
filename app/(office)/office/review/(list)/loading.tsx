export default function Loading() {
  return (
    <div className="flex flex-col gap-2" aria-busy="true" aria-label="Loading">
      {[0, 1, 2].map((i) => (
        <div key={i} className="h-16 animate-pulse rounded-xl bg-line/60" />
      ))}
    </div>
  );
}
