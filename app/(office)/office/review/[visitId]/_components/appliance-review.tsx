import { TEST_POINT_LABELS } from '@/lib/limits';
import { fmt } from '@/lib/certificates/snapshot';
import type { CertificateAppliance } from '@/lib/certificates/types';
import { VerdictBadge } from '@/components/ui/verdict-badge';

type Photo = { id: string; caption: string | null };

function sentence(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

// One appliance as the office reviews it: details, analyser (and any override of its calibration
// date), each reading with its derived figures, the verdict and every item's explanation.
export function ApplianceReview({ appliance: a, photos, visitId }: { appliance: CertificateAppliance; photos: Photo[]; visitId: string }) {
  return (
    <article className={`rounded-xl border bg-card p-3 ${a.level === 'danger' ? 'border-danger border-2' : 'border-line'}`} data-testid="review-appliance">
      <header className="flex flex-wrap items-start gap-2">
        <h3 className="min-w-0 flex-1 font-bold">{a.label}</h3>
        <VerdictBadge level={a.tested ? a.level : 'unknown'} label={a.tested ? undefined : 'Not tested'} />
      </header>
      <p className="text-sm text-ink-soft">
        {a.fuel} · {a.flueType}
        {a.serial ? ` · serial ${a.serial}` : ''}
        {a.heatInputGrossKw !== null ? ` · ${fmt(a.heatInputGrossKw, 1)} kW gross` : ''}
        {a.spillage ? ` · spillage ${a.spillage}` : ''}
      </p>
      {a.analyser ? (
        <p className="text-sm">
          Analyser {a.analyser.make} {a.analyser.model} ({a.analyser.serial}), calibration due {a.analyser.calibrationDue}
        </p>
      ) : null}
      {a.analyserOverrideReason ? (
        <p className="mt-1 rounded-lg border-l-4 border-service bg-service-soft p-2 text-sm text-service" data-testid="analyser-override">
          <span className="font-bold">Analyser override:</span> used past its calibration date. Engineer&apos;s reason: {a.analyserOverrideReason}
        </p>
      ) : null}
      {!a.tested ? <p className="mt-1">Not tested{a.notTestedReason ? `: ${a.notTestedReason}` : ''}.</p> : null}
      {a.readings.length > 0 ? (
        <div className="mt-2 overflow-x-auto">
          <table className="w-full min-w-[34rem] text-sm">
            <caption className="sr-only">Readings of {a.label}</caption>
            <thead>
              <tr className="border-b border-ink text-left">
                <th scope="col" className="py-1 pr-2">Test point</th>
                <th scope="col" className="py-1 pr-2 text-right">CO ppm</th>
                <th scope="col" className="py-1 pr-2 text-right">CO2 %</th>
                <th scope="col" className="py-1 pr-2 text-right">O2 %</th>
                <th scope="col" className="py-1 pr-2 text-right">Ratio</th>
                <th scope="col" className="py-1 pr-2 text-right">Air-free CO</th>
                <th scope="col" className="py-1 pr-2 text-right">Excess air %</th>
                <th scope="col" className="py-1 text-right">Flue loss %</th>
              </tr>
            </thead>
            <tbody>
              {a.readings.map((r) => (
                <tr key={`${r.testPoint}-${r.takenAt}`} className="border-b border-line">
                  <th scope="row" className="py-1 pr-2 text-left font-semibold">{TEST_POINT_LABELS[r.testPoint]}</th>
                  <td className="py-1 pr-2 text-right">{fmt(r.coPpm, 0)}</td>
                  <td className="py-1 pr-2 text-right">{fmt(r.co2Pct, 1)}</td>
                  <td className="py-1 pr-2 text-right">{fmt(r.o2Pct, 1)}</td>
                  <td className="py-1 pr-2 text-right">{fmt(r.ratio, 4)}</td>
                  <td className="py-1 pr-2 text-right">{fmt(r.coAirFreePpm, 0)}{r.airFreeRoute ? ` (${r.airFreeRoute === 'o2' ? 'O2' : 'CO2'})` : ''}</td>
                  <td className="py-1 pr-2 text-right">{fmt(r.excessAirPct, 1)}</td>
                  <td className="py-1 text-right">{fmt(r.flueLossPct, 1)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {a.readings.flatMap((r) => r.warnings.map((w) => (
            <p key={`${r.testPoint}-${w}`} className="text-sm text-service">{TEST_POINT_LABELS[r.testPoint]}: {w}</p>
          )))}
        </div>
      ) : null}
      {a.tested ? (
        <div className="mt-2 rounded-lg bg-paper p-2 text-sm">
          <p className="font-semibold">{a.decidedBy ? sentence(a.decidedBy.explanation) : 'Every judged figure is within its limit.'}</p>
          {a.decidedBy?.source ? <p className="text-ink-soft">Source: {a.decidedBy.source}</p> : null}
          <details className="mt-1">
            <summary className="cursor-pointer font-semibold text-copper">Every rule applied ({a.items.length})</summary>
            <ul className="mt-1 flex flex-col gap-1">
              {a.items.map((i) => (
                <li key={`${i.metric}-${i.testPoint}-${i.subject}`} className="flex flex-wrap items-center gap-2">
                  <VerdictBadge level={i.level} size="sm" />
                  <span>{sentence(i.explanation)}</span>
                </li>
              ))}
            </ul>
          </details>
        </div>
      ) : null}
      {photos.length > 0 ? (
        <div className="mt-2 flex flex-wrap gap-2">
          {photos.map((p) => (
            // eslint-disable-next-line @next/next/no-img-element -- streamed through the session-checked API, not static
            <img key={p.id} src={`/api/v1/review/${visitId}/photos/${p.id}`} alt={p.caption ?? `Photo of ${a.label}`} className="h-28 w-auto rounded-lg border border-line" />
          ))}
        </div>
      ) : null}
    </article>
  );
}
