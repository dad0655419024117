// The versions of a profile, newest first, with what was in force when, and a two-version comparison picker.
import { buttonClass } from '@/components/ui/button';

type VersionRow = { version: number; effectiveFrom: string; summary: string | null; ruleCount: number; createdByName: string | null };

function status(row: VersionRow, all: VersionRow[], today: string): string {
  if (row.effectiveFrom > today) return 'scheduled';
  const inForce = all.filter((v) => v.effectiveFrom <= today).sort((a, b) => (a.effectiveFrom === b.effectiveFrom ? b.version - a.version : b.effectiveFrom.localeCompare(a.effectiveFrom)))[0];
  return inForce?.version === row.version ? 'in force' : 'history';
}

export function VersionList({ ownerId, versions, today }: { ownerId: string; versions: VersionRow[]; today: string }) {
  const newestFirst = [...versions].reverse();
  const latest = newestFirst[0];
  const previous = newestFirst[1];
  return (
    <div className="flex flex-col gap-3">
      <ol className="flex flex-col gap-2" aria-label="Versions, newest first">
        {newestFirst.map((v) => (
          <li key={v.version} className="flex flex-wrap items-baseline gap-x-2 rounded-lg border border-line bg-white p-3 text-sm">
            <span className="font-semibold">Version {v.version}</span>
            <span>from {v.effectiveFrom}</span>
            <span className="rounded border border-line px-1.5 text-xs font-semibold uppercase">{status(v, versions, today)}</span>
            <span className="w-full text-ink-soft">
              {v.summary ?? 'No summary'} · {v.ruleCount} rule{v.ruleCount === 1 ? '' : 's'}
              {v.createdByName ? ` · by ${v.createdByName}` : ''}
            </span>
          </li>
        ))}
      </ol>
      {latest && previous ? (
        <form action={`/office/limits/${ownerId}/compare`} method="get" className="flex flex-wrap items-end gap-2" aria-label="Compare two versions">
          <label className="flex flex-col gap-1 text-sm font-semibold">
            Compare version
            <select name="from" defaultValue={previous.version} className="min-h-11 rounded-lg border border-line bg-white px-3 text-base font-normal">
              {newestFirst.map((v) => <option key={v.version} value={v.version}>{v.version}</option>)}
            </select>
          </label>
          <label className="flex flex-col gap-1 text-sm font-semibold">
            with version
            <select name="to" defaultValue={latest.version} className="min-h-11 rounded-lg border border-line bg-white px-3 text-base font-normal">
              {newestFirst.map((v) => <option key={v.version} value={v.version}>{v.version}</option>)}
            </select>
          </label>
          <button type="submit" className={buttonClass('secondary')}>Compare</button>
        </form>
      ) : null}
    </div>
  );
}
