import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { DASHBOARD_PERIOD_MONTHS, getDashboard, type RateGroup } from '@/db/dashboard';
import { listHighRoomChecks } from '@/db/insight';
import { formatMoney } from '@/lib/billing/money';
import { APPLIANCE_CATEGORY_LABELS, type ApplianceCategory } from '@/lib/limits';
import { organisationToday } from '../_components/today';

export const metadata: Metadata = { title: 'Dashboard' };

function Figure({ href, value, label, detail, tone = 'plain', testId }: { href: string; value: string; label: string; detail?: string; tone?: 'plain' | 'danger' | 'service'; testId: string }) {
  const toneClass = tone === 'danger' ? 'border-danger' : tone === 'service' ? 'border-service' : 'border-line';
  return (
    <li>
      <Link href={href} className={`block h-full rounded-xl border-2 bg-card p-3 shadow-sm hover:border-copper ${toneClass}`} data-testid={testId}>
        <span className="block text-3xl font-bold tabular-nums">{value}</span>
        <span className="block font-semibold">{label}</span>
        {detail ? <span className="block text-xs text-ink-soft">{detail}</span> : null}
      </Link>
    </li>
  );
}

function pct(n: number, total: number): string {
  return total ? `${Math.round((100 * n) / total)} %` : '—';
}

function RateTable({ title, groups, param, label }: { title: string; groups: RateGroup[]; param: 'category' | 'engineer'; label: (g: RateGroup) => string }) {
  return (
    <section className="overflow-x-auto rounded-xl border border-line bg-card">
      <table className="w-full text-left text-sm">
        <caption className="px-3 pt-3 text-left font-bold">{title}</caption>
        <thead className="text-xs uppercase text-ink-soft">
          <tr>
            <th scope="col" className="px-3 py-2">{param === 'category' ? 'Category' : 'Engineer'}</th>
            <th scope="col" className="px-2 py-2 text-right">Clear</th>
            <th scope="col" className="px-2 py-2 text-right">Service</th>
            <th scope="col" className="px-2 py-2 text-right">Danger</th>
            <th scope="col" className="px-3 py-2 text-right">All</th>
          </tr>
        </thead>
        <tbody>
          {groups.map((g) => {
            const base = `/office/dashboard/inspections?${param}=${encodeURIComponent(g.key)}`;
            return (
              <tr key={g.key} className="border-t border-line">
                <th scope="row" className="px-3 py-2 font-semibold">{label(g)}</th>
                {(['clear', 'service', 'danger'] as const).map((level) => (
                  <td key={level} className="px-2 py-2 text-right tabular-nums">
                    <Link href={`${base}&verdict=${level}`} className="underline decoration-line underline-offset-2 hover:decoration-copper">
                      {pct(g.counts[level], g.counts.total)}
                      <span className="sr-only"> {level}, </span> <span className="text-xs text-ink-soft">({g.counts[level]})</span>
                    </Link>
                  </td>
                ))}
                <td className="px-3 py-2 text-right tabular-nums">
                  <Link href={base} className="underline decoration-line underline-offset-2 hover:decoration-copper">{g.counts.total}</Link>
                </td>
              </tr>
            );
          })}
          {groups.length === 0 ? (
            <tr>
              <td colSpan={5} className="px-3 py-3 text-ink-soft">No judged inspections in the period.</td>
            </tr>
          ) : null}
        </tbody>
      </table>
    </section>
  );
}

export default async function DashboardPage() {
  const user = await requirePageRole(['office']);
  const today = await organisationToday(user.organisationId);
  const [d, roomChecks] = await Promise.all([getDashboard({ organisationId: user.organisationId, today }), listHighRoomChecks({ organisationId: user.organisationId, minPpm: 10, limit: 5 })]);
  return (
    <div className="flex flex-col gap-5" data-testid="dashboard-page">
      <header>
        <h1 className="text-2xl font-bold">Dashboard</h1>
        <p className="text-sm text-ink-soft">
          The whole book on {today}. Rates and money cover the last {DASHBOARD_PERIOD_MONTHS} months (from {d.periodStart}). Every figure opens the list behind it.
        </p>
      </header>

      <section aria-labelledby="safety-heading">
        <h2 id="safety-heading" className="mb-2 text-lg font-bold">Safety and renewals</h2>
        <ul className="grid grid-cols-2 gap-3 md:grid-cols-4">
          <Figure href="/office/dashboard/danger" value={String(d.dangerFindings.open)} label="Open danger findings" detail={d.dangerFindings.oldestDaysOpen !== null ? `oldest open ${d.dangerFindings.oldestDaysOpen} days` : 'none open'} tone={d.dangerFindings.open ? 'danger' : 'plain'} testId="figure-danger" />
          <Figure href="/office/dashboard/overdue" value={String(d.renewals.overdue)} label="Overdue certificates" detail="expired, no renewal yet" tone={d.renewals.overdue ? 'service' : 'plain'} testId="figure-overdue" />
          <Figure href="/office/dashboard/expiring" value={String(d.renewals.expiring)} label="Expiring soon" detail={`within ${d.renewals.expiringWithinDays} days`} testId="figure-expiring" />
          <Figure href="/office/dashboard/no-access" value={d.noAccess.rate === null ? '—' : pct(d.noAccess.count, d.noAccess.attended)} label="No-access rate" detail={`${d.noAccess.count} of ${d.noAccess.attended} attended visits`} testId="figure-no-access" />
        </ul>
      </section>

      <section aria-labelledby="money-heading">
        <h2 id="money-heading" className="mb-2 text-lg font-bold">Money</h2>
        <ul className="grid grid-cols-2 gap-3 md:grid-cols-4">
          <Figure href="/office/dashboard/invoices?state=paid" value={formatMoney(d.money.revenueMinor, d.currency)} label="Received" detail="payments less refunds" testId="figure-revenue" />
          <Figure href="/office/dashboard/invoices?state=unpaid" value={formatMoney(d.money.unpaidMinor, d.currency)} label="Unpaid" detail={`${d.money.unpaidCount} invoices, ${d.money.overdueCount} past due`} tone={d.money.overdueCount ? 'service' : 'plain'} testId="figure-unpaid" />
        </ul>
      </section>

      <section aria-labelledby="rates-heading" className="flex flex-col gap-3">
        <h2 id="rates-heading" className="text-lg font-bold">
          Verdicts: {pct(d.rates.overall.clear, d.rates.overall.total)} clear, {pct(d.rates.overall.service, d.rates.overall.total)} service, {pct(d.rates.overall.danger, d.rates.overall.total)} danger
          <span className="block text-sm font-normal text-ink-soft">of <Link href="/office/dashboard/inspections" className="underline">{d.rates.overall.total} judged inspections</Link></span>
        </h2>
        <div className="grid gap-3 lg:grid-cols-2">
          <RateTable title="By appliance category" groups={d.rates.byCategory} param="category" label={(g) => APPLIANCE_CATEGORY_LABELS[g.key as ApplianceCategory] ?? g.key} />
          <RateTable title="By engineer" groups={d.rates.byEngineer} param="engineer" label={(g) => g.label} />
        </div>
      </section>

      <section aria-labelledby="export-heading" className="rounded-xl border border-line bg-card p-3">
        <h2 id="export-heading" className="text-lg font-bold">Export inspections and readings</h2>
        <form action="/api/v1/exports/inspections" method="get" className="mt-2 flex flex-wrap items-end gap-3 text-sm">
          <label className="flex flex-col gap-1">
            From
            <input type="date" name="from" required defaultValue={d.periodStart} className="min-h-11 rounded-md border border-line px-2" />
          </label>
          <label className="flex flex-col gap-1">
            To
            <input type="date" name="to" required defaultValue={today} className="min-h-11 rounded-md border border-line px-2" />
          </label>
          <button type="submit" className="min-h-11 rounded-md bg-copper px-4 font-semibold text-white hover:bg-copper-dark">Download CSV</button>
        </form>
        <p className="mt-1 text-xs text-ink-soft">One row per reading, by visit date. Cells that a spreadsheet could run as a formula are prefixed with a quote.</p>
      </section>

      {roomChecks.length ? (
        <section aria-labelledby="room-heading">
          <h2 id="room-heading" className="mb-2 text-lg font-bold">Highest room CO checks</h2>
          <ul className="flex flex-col gap-2">
            {roomChecks.map((c) => (
              <li key={c.id} className="rounded-lg border border-line bg-card p-3 text-sm">
                <Link href={`/office/insight/room-checks/${c.id}`} className="font-bold underline">{c.coPpm} ppm in the {c.room.toLowerCase()}</Link> · {c.siteReference}, {c.siteAddress} · {c.takenAt.slice(0, 10)}
                <span className="block text-ink-soft">Open the exposure estimate</span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
