import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { listEngineers } from '@/db/schedule';
import { AnalyserForm } from '../_components/analyser-form';

export const metadata: Metadata = { title: 'Add analyser' };

export default async function NewAnalyserPage() {
  const user = await requirePageRole(['office']);
  const engineers = await listEngineers(user.organisationId);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Add an analyser</h1>
      <AnalyserForm engineers={engineers} initial={{ serial: '', make: '', model: '', calibratedOn: '', calibrationDue: '', coRangeMaxPpm: 2000, assignedTo: '' }} />
    </div>
  );
}
