'use client';
// The visit at a glance: the site, how to get in, the appliances on record with their previous
// results and "getting worse" flags, and where each part of the recording stands.
import { SafetyCaution } from '@/components/safety/caution';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { Button } from '@/components/ui/button';
import { FLUE_TYPE_LABELS } from '@/lib/validations/flue-types';
import { FUEL_LABELS, TEST_POINT_LABELS } from '@/lib/limits';
import { currentReadings, formatRatio } from '@/lib/field';
import { applianceLabel, makeMutation, type VisitContext } from './use-field';
import { TrendSummary } from './insight-trend';

export function VisitOverview({ ctx }: { ctx: VisitContext }) {
  const visit = ctx.visit!;
  const tz = ctx.field.bundle?.timeZone ?? 'UTC';
  const when = (iso: string) => new Date(iso).toLocaleString('en-GB', { weekday: 'short', day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', timeZone: tz });
  const roomCoHigh = ctx.verdicts.installation?.verdict.items.some((i) => i.metric === 'room_co_ppm' && (i.level === 'service' || i.level === 'danger')) ?? false;
  const arrive = () => ctx.field.commit(makeMutation('visit.arrive', visit.id, { arrivedAt: new Date().toISOString() }), 'Arrived on site');

  return (
    <div className="flex flex-col gap-4">
      <section aria-labelledby="site-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <h2 id="site-title" className="text-lg font-bold">
          Site
        </h2>
        <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
          <dt className="font-semibold">Booked</dt>
          <dd>
            {when(visit.windowStart)} – {new Date(visit.windowEnd).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit', timeZone: tz })}
          </dd>
          {visit.site.accessNotes ? (
            <>
              <dt className="font-semibold">Access</dt>
              <dd data-testid="access-notes">{visit.site.accessNotes}</dd>
            </>
          ) : null}
          {visit.site.tenantName ? (
            <>
              <dt className="font-semibold">Occupant</dt>
              <dd>
                {visit.site.tenantName}
                {visit.site.tenantPhone ? (
                  <>
                    {' · '}
                    <a className="font-semibold text-copper underline" href={`tel:${visit.site.tenantPhone.replace(/\s+/g, '')}`}>
                      {visit.site.tenantPhone}
                    </a>
                  </>
                ) : null}
              </dd>
            </>
          ) : null}
          {visit.notes ? (
            <>
              <dt className="font-semibold">Office notes</dt>
              <dd>{visit.notes}</dd>
            </>
          ) : null}
          <dt className="font-semibold">Limits</dt>
          <dd>{visit.site.jurisdictionName}, in force {ctx.date}</dd>
        </dl>
        {ctx.record.arrivedAt ? (
          <p className="text-sm text-clear">On site since {when(ctx.record.arrivedAt)}</p>
        ) : !ctx.closed ? (
          <Button onClick={() => void arrive()} className="self-start">
            I’m on site
          </Button>
        ) : null}
      </section>

      <section aria-labelledby="appliances-title" className="flex flex-col gap-2">
        <h2 id="appliances-title" className="text-lg font-bold">
          Appliances on record
        </h2>
        <ul className="flex flex-col gap-2">
          {ctx.appliances.map((a, index) => {
            const inspection = ctx.record.inspections[a.id];
            const details = inspection?.details ?? a.details;
            const verdict = ctx.verdicts.appliances[a.id]?.verdict;
            const readings = currentReadings(inspection?.readings ?? []);
            return (
              <li key={a.id} className="rounded-xl border border-line bg-card p-3" data-testid="appliance-card">
                <a href={`#appliance-${a.id}`} className="flex flex-col gap-1">
                  <span className="flex items-center justify-between gap-2">
                    <span className="text-base font-bold">
                      {index + 1}. {applianceLabel(details)}
                    </span>
                    {verdict ? <VerdictBadge level={verdict.overall} size="sm" /> : inspection?.notTestedReason ? <span className="text-xs font-bold text-ink-soft">Not tested</span> : null}
                  </span>
                  <span className="text-sm text-ink-soft">
                    {[details.make, details.model].filter(Boolean).join(' ') || 'Make and model not recorded'} · {FUEL_LABELS[details.fuel]} · {FLUE_TYPE_LABELS[details.flueType]}
                    {details.serial ? ` · serial ${details.serial}` : ''}
                  </span>
                  <span className="text-sm">{readings.length > 0 ? `${readings.length} ${readings.length === 1 ? 'reading' : 'readings'} recorded` : 'No readings yet'}{a.added ? ' · added on site' : ''}</span>
                </a>
                <TrendSummary trend={a.trend} />
                {a.history.length > 0 ? (
                  <details className="mt-2 text-sm">
                    <summary className="min-h-11 cursor-pointer py-2 font-semibold text-copper-dark">Previous results ({a.history.length})</summary>
                    <ul className="flex flex-col gap-2">
                      {a.history.map((h) => (
                        <li key={h.visitId} className="rounded-lg bg-paper p-2">
                          <div className="flex items-center justify-between gap-2">
                            <span className="font-semibold">{new Date(`${h.date}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })}</span>
                            {h.verdict ? <VerdictBadge level={h.verdict} size="sm" /> : null}
                          </div>
                          <ul className="tabular">
                            {h.readings.map((r, i) => (
                              <li key={i}>
                                {TEST_POINT_LABELS[r.testPoint]}: CO {r.coPpm} ppm{r.co2Pct !== null ? `, CO2 ${r.co2Pct} %` : ''}
                                {r.o2Pct !== null ? `, O2 ${r.o2Pct} %` : ''}
                                {r.ratio !== null ? `, ratio ${formatRatio(r.ratio)}` : ''}
                              </li>
                            ))}
                          </ul>
                          {h.findings.map((f, i) => (
                            <p key={i} className="text-ink-soft">
                              {f.severity}: {f.description}
                            </p>
                          ))}
                        </li>
                      ))}
                    </ul>
                  </details>
                ) : (
                  <p className="mt-1 text-xs text-ink-soft">No earlier results on record.</p>
                )}
              </li>
            );
          })}
        </ul>
      </section>

      <section aria-labelledby="next-title" className="flex flex-col gap-2">
        <h2 id="next-title" className="sr-only">
          Rest of the visit
        </h2>
        <a href="#installation" className="flex min-h-12 items-center justify-between rounded-xl border border-line bg-card p-3 font-semibold">
          <span>Rooms & gas: room CO checks and tightness test</span>
          {ctx.verdicts.installation ? <VerdictBadge level={ctx.verdicts.installation.verdict.overall} size="sm" /> : <span className="text-sm text-ink-soft">Not started</span>}
        </a>
        <a href="#finish" className="flex min-h-12 items-center justify-between rounded-xl border border-line bg-card p-3 font-semibold">
          <span>Finish: make safe, signature, submit</span>
          <span className="text-sm text-ink-soft">{ctx.blockers.length === 0 ? 'Ready' : `${ctx.blockers.length} to do`}</span>
        </a>
        {!ctx.closed ? (
          <a href="#no-access" className="flex min-h-12 items-center rounded-xl border border-dashed border-line p-3 text-sm font-semibold text-ink-soft">
            Couldn’t get in? Record no access
          </a>
        ) : null}
      </section>
      <SafetyCaution compact showRoomCoAdvice={roomCoHigh} />
    </div>
  );
}
