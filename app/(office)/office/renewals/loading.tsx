export default function RenewalsLoading() {
  return (
    <div className="flex flex-col gap-3" aria-busy="true">
      <div className="h-8 w-48 animate-pulse rounded bg-line" />
      <div className="h-64 animate-pulse rounded-xl bg-line/60" />
      <p className="sr-only">Loading renewals…</p>
    </div>
  );
}
