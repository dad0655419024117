import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { EXPIRING_WITHIN_DAYS, listRenewals } from '@/db/dashboard';
import { RenewalList } from '../_components/renewal-list';
import { organisationToday } from '../_components/today';

export const metadata: Metadata = { title: 'Certificates expiring soon' };

export default async function ExpiringPage() {
  const user = await requirePageRole(['office']);
  const today = await organisationToday(user.organisationId);
  const rows = await listRenewals({ organisationId: user.organisationId, today, state: 'expiring' });
  return <RenewalList title="Certificates expiring soon" rows={rows} note={`within ${EXPIRING_WITHIN_DAYS} days`} testId="expiring-list" />;
}
