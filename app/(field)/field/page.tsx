import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { MyVisits } from './_components/my-visits';

export const metadata: Metadata = { title: 'My visits' };

// The list itself is drawn on the phone from its saved copy (and refreshed from /api/v1/field/visits
// when online), so this page works offline once the service worker has it.
export default async function FieldHome() {
  await requirePageRole(['engineer']);
  return <MyVisits />;
}
