'use client';
// Everything recorded for one appliance: its earlier inspections and "getting worse" flag, details,
// checks, analyser, readings at high fire, low fire and as left, findings and photos, with the
// appliance's verdict as it stands.
import { SafetyCaution } from '@/components/safety/caution';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { TEST_POINTS } from '@/lib/limits';
import { AnalyserPicker, Checklist, DetailsCard, NotTested } from './appliance-parts';
import { Findings } from './findings';
import { PhotoStrip } from './photos';
import { ReadingCard } from './reading-card';
import { UnitsToggle } from './units-toggle';
import { VerdictBlock } from './verdict-list';
import { applianceLabel, type VisitAppliance, type VisitContext } from './use-field';
import { TrendDetail } from './insight-trend';

export function ApplianceScreen({ ctx, appliance }: { ctx: VisitContext; appliance: VisitAppliance }) {
  const inspection = ctx.inspectionOf(appliance.id);
  const details = inspection.details;
  const label = applianceLabel(details);
  const result = ctx.verdicts.appliances[appliance.id];
  const roomCoHigh = ctx.verdicts.installation?.verdict.items.some((i) => i.metric === 'room_co_ppm' && (i.level === 'service' || i.level === 'danger')) ?? false;

  return (
    <div className="flex flex-col gap-3" data-testid="appliance-screen">
      <div className="flex items-center justify-between gap-2">
        <h2 className="text-lg font-bold">{label}</h2>
        {result ? <VerdictBadge level={result.verdict.overall} /> : null}
      </div>
      <TrendDetail trend={appliance.trend} headingId={`${appliance.id}-history`} />
      <UnitsToggle />
      <DetailsCard key={`${appliance.id}-${inspection.detailsConfirmed}`} ctx={ctx} appliance={appliance} />
      <Checklist ctx={ctx} appliance={appliance} />
      <AnalyserPicker ctx={ctx} appliance={appliance} />
      <h3 className="text-base font-bold">Analyser readings</h3>
      {TEST_POINTS.map((tp) => (
        <ReadingCard key={`${appliance.id}-${tp}`} ctx={ctx} applianceId={appliance.id} testPoint={tp} details={details} />
      ))}
      <section aria-labelledby={`${appliance.id}-photos`} className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <h3 id={`${appliance.id}-photos`} className="text-base font-bold">
          Photos
        </h3>
        <PhotoStrip ctx={ctx} target={{ purpose: 'appliance', applianceId: appliance.id, findingId: null }} label={label} />
      </section>
      <Findings ctx={ctx} applianceId={appliance.id} subject={label} />
      <NotTested ctx={ctx} appliance={appliance} />
      {result ? <VerdictBlock verdict={result.verdict} title={`Verdict: ${label}`} /> : null}
      <SafetyCaution compact showRoomCoAdvice={roomCoHigh} />
    </div>
  );
}
