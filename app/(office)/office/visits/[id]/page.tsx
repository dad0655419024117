import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getVisitReport, type StoredInspection, type VisitReport } from '@/db/inspections';
import { analyseReading, currentReadings, formatFixed, formatRatio } from '@/lib/field';
import { APPLIANCE_CATEGORY_LABELS, FUEL_LABELS, TEST_POINT_LABELS, type Verdict } from '@/lib/limits';
import { CHECKLIST_ITEMS, FINDING_ACTION_LABELS, FINDING_SEVERITY_LABELS, FLUE_TYPE_LABELS, MADE_SAFE_BY_LABELS } from '@/lib/validations/inspection';
import { SafetyCaution } from '@/components/safety/caution';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { Alert } from '@/components/ui/alert';

export const metadata: Metadata = { title: 'Visit record' };

// The office's read-only view of what an engineer recorded and submitted, with the verdict of
// record the server worked out and the limits it used. Certificate issuing builds on this page.

function VerdictItemsList({ verdict }: { verdict: Verdict }) {
  return (
    <ul className="flex flex-col gap-2">
      {verdict.items.map((item, i) => (
        <li key={i} className="flex flex-col gap-1 text-sm sm:flex-row sm:items-start sm:gap-3">
          <VerdictBadge level={item.level} size="sm" />
          <span>{item.explanation}</span>
        </li>
      ))}
    </ul>
  );
}

function answerText(value: string | null | undefined, pass: string, fail: string): string {
  if (value === 'pass') return pass;
  if (value === 'fail') return fail;
  if (value === 'na') return 'Not applicable';
  return 'Not answered';
}

function InspectionSection({ report, inspection, index }: { report: VisitReport; inspection: StoredInspection; index: number }) {
  const d = inspection.details;
  const live = new Set(currentReadings(inspection.readings).map((r) => r.id));
  const analyser = report.analysers.find((a) => a.id === inspection.analyserId);
  const conflicts = report.conflicts.filter((c) => c.applianceId === inspection.applianceId);
  const differs = report.discrepancies.find((x) => x.subject === 'appliance' && x.applianceId === inspection.applianceId);
  const photos = report.photos.filter((p) => p.purpose === 'appliance' && p.applianceId === inspection.applianceId);
  return (
    <section aria-labelledby={`inspection-${inspection.id}`} className="flex flex-col gap-3 rounded-xl border border-line bg-card p-4" data-testid="office-inspection" data-appliance-id={inspection.applianceId} data-verdict-of-record={inspection.verdictOfRecord ?? 'none'}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id={`inspection-${inspection.id}`} className="text-lg font-bold">
          {index + 1}. {APPLIANCE_CATEGORY_LABELS[d.category]}, {d.location}
        </h2>
        {inspection.verdictOfRecord ? <VerdictBadge level={inspection.verdictOfRecord} /> : <span className="text-sm font-bold text-ink-soft">{inspection.notTestedReason ? 'Not tested' : 'No verdict'}</span>}
      </div>
      <p className="text-sm text-ink-soft">
        {[d.make, d.model].filter(Boolean).join(' ') || 'Make and model not recorded'} · serial {d.serial ?? '—'} · {FUEL_LABELS[d.fuel]} · {FLUE_TYPE_LABELS[d.flueType]} · details {inspection.detailsConfirmed ? 'confirmed on site' : 'not confirmed'}
      </p>
      {inspection.notTestedReason ? <p className="text-sm">Not tested: {inspection.notTestedReason}</p> : null}
      {conflicts.map((c) => (
        <Alert key={c.id} tone="warning" title={c.kind === 'appliance_details' ? 'The appliance record changed while the engineer was recording' : 'Two readings for the same test point'}>
          {c.summary}
        </Alert>
      ))}
      <dl className="grid grid-cols-1 gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
        {CHECKLIST_ITEMS.map((item) => (
          <div key={item.key} className="flex justify-between gap-2 border-b border-line/60 py-1">
            <dt className="text-ink-soft">{item.label}</dt>
            <dd className="font-semibold">{answerText(item.key === 'spillage' ? inspection.spillage : inspection.checklist[item.key], item.pass, item.fail)}</dd>
          </div>
        ))}
        <div className="flex justify-between gap-2 border-b border-line/60 py-1">
          <dt className="text-ink-soft">Operating pressure</dt>
          <dd className="font-semibold">{inspection.operatingPressureMbar === null ? '—' : `${inspection.operatingPressureMbar} mbar`}</dd>
        </div>
        <div className="flex justify-between gap-2 border-b border-line/60 py-1">
          <dt className="text-ink-soft">Heat input (meter test)</dt>
          <dd className="font-semibold">{inspection.heatInputGrossKw === null ? '—' : `${formatFixed(inspection.heatInputGrossKw, 2)} kW gross, ${formatFixed(inspection.heatInputNetKw, 2)} kW net`}</dd>
        </div>
        <div className="flex justify-between gap-2 border-b border-line/60 py-1">
          <dt className="text-ink-soft">Analyser</dt>
          <dd className="font-semibold">{analyser ? `${analyser.serial} (${analyser.make} ${analyser.model}), calibration due ${analyser.calibrationDue}` : '—'}</dd>
        </div>
      </dl>
      {inspection.analyserOverrideReason ? <p className="text-sm">Reason for using an analyser past its calibration date: {inspection.analyserOverrideReason}</p> : null}
      {inspection.readings.length === 0 ? <p className="text-sm text-ink-soft">No analyser readings.</p> : null}
      {/* Focusable so the wide table can be scrolled from the keyboard too. */}
      <div className={`overflow-x-auto ${inspection.readings.length === 0 ? 'hidden' : ''}`} tabIndex={0} role="region" aria-label={`Readings, ${d.location}`}>
        <table className="w-full text-left text-sm tabular">
          <caption className="sr-only">Analyser readings</caption>
          <thead>
            <tr className="border-b border-line">
              <th scope="col" className="py-1 pr-3">Test point</th>
              <th scope="col" className="py-1 pr-3">CO ppm</th>
              <th scope="col" className="py-1 pr-3">CO2 %</th>
              <th scope="col" className="py-1 pr-3">O2 %</th>
              <th scope="col" className="py-1 pr-3">Flue / air °C</th>
              <th scope="col" className="py-1 pr-3">Ratio</th>
              <th scope="col" className="py-1 pr-3">Air-free CO</th>
              <th scope="col" className="py-1">Taken</th>
            </tr>
          </thead>
          <tbody>
            {inspection.readings.map((r) => {
              const a = analyseReading(r, d.fuel).analysis;
              const superseded = !live.has(r.id);
              return (
                <tr key={r.id} className={`border-b border-line/60 ${superseded ? 'text-ink-soft line-through' : ''}`} data-testid="office-reading">
                  <td className="py-1 pr-3">
                    {TEST_POINT_LABELS[r.testPoint]}
                    {superseded ? <span className="sr-only"> (corrected later)</span> : null}
                  </td>
                  <td className="py-1 pr-3">{r.coPpm}</td>
                  <td className="py-1 pr-3">{r.co2Pct ?? '—'}</td>
                  <td className="py-1 pr-3">{r.o2Pct ?? '—'}</td>
                  <td className="py-1 pr-3">
                    {formatFixed(r.flueTempC, 0)} / {formatFixed(r.airTempC, 0)}
                    {r.tempUnit === 'F' ? ' (typed in °F)' : ''}
                  </td>
                  <td className="py-1 pr-3">{formatRatio(a?.ratio)}</td>
                  <td className="py-1 pr-3">{a?.coAirFreeFromO2Ppm != null ? `${formatFixed(a.coAirFreeFromO2Ppm, 0)} ppm` : '—'}</td>
                  <td className="py-1">{new Date(r.takenAt).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit', timeZone: 'UTC' })} UTC</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {inspection.verdict ? (
        <div className="flex flex-col gap-2 rounded-lg bg-paper p-3">
          <p className="text-sm font-bold">
            Verdict of record (worked out by the server on submit{inspection.limits ? `, limits in force ${inspection.limits.date}` : ''})
          </p>
          <VerdictItemsList verdict={inspection.verdict} />
          {differs ? (
            <p className="text-sm text-service">
              The engineer’s phone showed “{differs.clientVerdict}”; the server’s “{differs.serverVerdict}” stands.
            </p>
          ) : null}
        </div>
      ) : null}
      {photos.length > 0 ? (
        <ul className="flex flex-wrap gap-2">
          {photos.map((p) => (
            <li key={p.id}>
              <a href={`/api/v1/photos/${p.id}`} target="_blank" rel="noreferrer">
                {/* eslint-disable-next-line @next/next/no-img-element -- served by our checked route, not a public asset */}
                <img src={`/api/v1/photos/${p.id}`} alt={`Photo of the ${d.location.toLowerCase()} appliance${p.caption ? `: ${p.caption}` : ''}`} className="h-28 w-28 rounded-lg border border-line object-cover" />
              </a>
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

export default async function OfficeVisitPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  if (!/^[0-9a-f-]{36}$/i.test(id)) notFound();
  const report = await getVisitReport({ organisationId: user.organisationId, visitId: id });
  if (!report) notFound();
  const { visit, site, records } = report;
  const roomHigh = records.roomChecks.some((c) => c.coPpm >= 10);
  const signature = records.signoff?.signaturePhotoId ?? null;

  return (
    <div className="flex flex-col gap-4" data-testid="office-visit">
      <p>
        <Link href={`/office/board/visits/${visit.id}`} className="text-sm text-copper underline underline-offset-4">
          Booking details
        </Link>
      </p>
      <div className="sticky top-0 z-10 -mx-3 flex flex-wrap items-center justify-between gap-2 border-b border-line bg-paper/95 px-3 py-2">
        <div>
          <h1 className="text-2xl font-bold">{site.address}</h1>
          <p className="text-sm text-ink-soft">
            {site.town} {site.postcode} · {site.reference} · {site.jurisdictionName}
          </p>
        </div>
        <div className="flex items-center gap-2" data-testid="office-overall">
          <span className="text-sm font-semibold">Visit verdict</span>
          {visit.overallVerdict ? <VerdictBadge level={visit.overallVerdict} size="lg" /> : <span className="text-sm text-ink-soft">Not submitted yet</span>}
        </div>
      </div>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="font-semibold">Status</dt>
        <dd data-testid="office-visit-status">{visit.status.replace('_', ' ')}</dd>
        <dt className="font-semibold">Engineer</dt>
        <dd>{visit.engineerName ?? '—'}</dd>
        <dt className="font-semibold">On site</dt>
        <dd>{visit.arrivedAt ? new Date(visit.arrivedAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : '—'}</dd>
        <dt className="font-semibold">Submitted</dt>
        <dd>{visit.submittedAt ? new Date(visit.submittedAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : '—'}</dd>
        {visit.noAccessAt ? (
          <>
            <dt className="font-semibold">No access</dt>
            <dd>
              {new Date(visit.noAccessAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })} — {visit.noAccessNote}
            </dd>
          </>
        ) : null}
      </dl>
      {report.conflicts.some((c) => !c.resolvedAt) ? (
        <Alert tone="warning" title="Changes to review">
          {report.conflicts.filter((c) => !c.resolvedAt).length} conflict(s) between the office’s records and what the engineer recorded; both versions are kept below.
        </Alert>
      ) : null}
      {records.inspections.map((inspection, i) => (
        <InspectionSection key={inspection.id} report={report} inspection={inspection} index={i} />
      ))}

      <section aria-labelledby="installation-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-4">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 id="installation-title" className="text-lg font-bold">
            Installation
          </h2>
          {visit.installationVerdict ? <VerdictBadge level={visit.installationVerdict.overall} /> : null}
        </div>
        <ul className="text-sm">
          {records.roomChecks.map((c) => (
            <li key={c.id} data-testid="office-room-check">
              Room CO, {c.room}: {c.coPpm} ppm{c.minutes !== null ? ` over ${c.minutes} min` : ''}
            </li>
          ))}
          {records.tightness ? (
            <li>
              Tightness test: {records.tightness.startMbar} → {records.tightness.endMbar} mbar over {records.tightness.durationMin} min (drop {formatFixed(records.tightness.startMbar - records.tightness.endMbar, 1)} mbar)
            </li>
          ) : null}
          {records.roomChecks.length === 0 && !records.tightness ? <li className="text-ink-soft">No room checks or tightness test recorded.</li> : null}
        </ul>
        {visit.installationVerdict ? <VerdictItemsList verdict={visit.installationVerdict} /> : null}
      </section>

      <section aria-labelledby="findings-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-4">
        <h2 id="findings-title" className="text-lg font-bold">
          Findings and action taken
        </h2>
        {records.findings.length === 0 ? <p className="text-sm text-ink-soft">None.</p> : null}
        <ul className="flex flex-col gap-2 text-sm">
          {records.findings.map((f) => (
            <li key={f.id} data-testid="office-finding">
              <span className="font-semibold">{FINDING_SEVERITY_LABELS[f.severity]}</span>: {f.description} — {FINDING_ACTION_LABELS[f.action]}
            </li>
          ))}
        </ul>
        {records.makeSafe.map((m) => (
          <p key={m.id} className="text-sm" data-testid="office-make-safe">
            Made safe{m.applianceId ? ` (${report.appliances.find((a) => a.id === m.applianceId)?.details.location ?? 'appliance'})` : ' (installation)'}: {MADE_SAFE_BY_LABELS[m.madeSafeBy]}; occupant warned; consent {m.consent}
            {m.occupantName ? ` (${m.occupantName})` : ''}
            {m.refusalNote ? `: ${m.refusalNote}` : ''}; warning notice left.
          </p>
        ))}
      </section>

      <section aria-labelledby="signoff-title" className="flex flex-col gap-2 rounded-xl border border-line bg-card p-4">
        <h2 id="signoff-title" className="text-lg font-bold">
          Sign-off
        </h2>
        {records.signoff ? (
          <div className="flex flex-col gap-2 text-sm">
            {signature ? (
              <>
                <p>Signed by {records.signoff.occupantName}</p>
                {/* eslint-disable-next-line @next/next/no-img-element -- served by our checked route */}
                <img src={`/api/v1/photos/${signature}`} alt={`Signature of ${records.signoff.occupantName ?? 'the occupant'}`} className="h-24 w-auto self-start rounded border border-line bg-white" data-testid="office-signature" />
              </>
            ) : (
              <p>No signature: {records.signoff.noSignatureReason}</p>
            )}
            <p>Engineer’s declaration: “{records.signoff.declarationText}”</p>
          </div>
        ) : (
          <p className="text-sm text-ink-soft">Not signed off yet.</p>
        )}
      </section>
      <SafetyCaution showRoomCoAdvice={roomHigh} />
    </div>
  );
}
