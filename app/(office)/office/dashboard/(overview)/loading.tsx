export default function DashboardLoading() {
  return (
    <div className="flex flex-col gap-3" aria-busy="true" aria-label="Loading the dashboard">
      <div className="h-8 w-48 animate-pulse rounded bg-line" />
      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
        {[0, 1, 2, 3].map((i) => (
          <div key={i} className="h-24 animate-pulse rounded-xl bg-line/60" />
        ))}
      </div>
    </div>
  );
}
