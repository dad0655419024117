import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { listRenewals } from '@/db/dashboard';
import { RenewalList } from '../_components/renewal-list';
import { organisationToday } from '../_components/today';

export const metadata: Metadata = { title: 'Overdue certificates' };

export default async function OverduePage() {
  const user = await requirePageRole(['office']);
  const today = await organisationToday(user.organisationId);
  const rows = await listRenewals({ organisationId: user.organisationId, today, state: 'overdue' });
  return <RenewalList title="Overdue certificates" rows={rows} note="sites whose certificate has run out" testId="overdue-list" />;
}
