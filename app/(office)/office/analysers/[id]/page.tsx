import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getAnalyser, listAnalyserOverrides } from '@/db/analysers';
import { listEngineers } from '@/db/schedule';
import { Alert } from '@/components/ui/alert';
import { AnalyserForm } from '../_components/analyser-form';
import { CalibrationBadge } from '../_components/calibration-badge';

export const metadata: Metadata = { title: 'Analyser' };

export default async function AnalyserPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const analyser = await getAnalyser(user.organisationId, id);
  if (!analyser) notFound();
  const [engineers, overrides] = await Promise.all([listEngineers(user.organisationId), listAnalyserOverrides(user.organisationId, { analyserId: id })]);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="flex flex-wrap items-center gap-2 text-2xl font-bold">{analyser.serial} <CalibrationBadge status={analyser.status} /></h1>
      {analyser.status.state !== 'ok' ? <Alert tone={analyser.status.state === 'overdue' ? 'error' : 'warning'}>{analyser.status.message}</Alert> : null}
      <AnalyserForm id={analyser.id} engineers={engineers} initial={{ serial: analyser.serial, make: analyser.make, model: analyser.model, calibratedOn: analyser.calibratedOn, calibrationDue: analyser.calibrationDue, coRangeMaxPpm: analyser.coRangeMaxPpm, assignedTo: analyser.assignedTo ?? '' }} />
      <section aria-labelledby="overrides-title" className="flex flex-col gap-2">
        <h2 id="overrides-title" className="text-lg font-bold">Used past calibration ({overrides.length})</h2>
        {overrides.length === 0 ? <p className="text-sm text-ink-soft">No overrides recorded.</p> : (
          <ul className="flex flex-col gap-1 text-sm">
            {overrides.map((o) => (
              <li key={o.id} className="rounded-lg border border-line bg-card p-2">
                <strong>{new Date(o.at).toLocaleString('en-GB')}</strong> — {o.engineerName}: “{o.reason}” (was due {o.calibrationDue})
                {o.visitId ? <> · <Link className="text-copper underline" href={`/office/board/visits/${o.visitId}`}>visit</Link></> : null}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
