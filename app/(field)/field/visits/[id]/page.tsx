import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { VisitScreen } from '../../_components/visit-screen';

export const metadata: Metadata = { title: 'Visit' };

// The visit is read from the phone's saved copy, not from the database here: the page must open in
// a cellar with no signal, from the service worker's copy, and show what was recorded offline.
export default async function VisitPage({ params }: { params: Promise<{ id: string }> }) {
  await requirePageRole(['engineer']);
  const { id } = await params;
  return <VisitScreen visitId={id} />;
}
