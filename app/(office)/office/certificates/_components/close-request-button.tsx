'use client';
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { fetchJson } from '@/lib/fetch-json';
import { Button } from '@/components/ui/button';

// Closes a renewal request once the visit is booked.
export function CloseRequestButton({ id }: { id: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      type="button"
      variant="secondary"
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        await fetchJson(`/api/v1/review/renewal-requests/${id}`, { method: 'DELETE' }).catch(() => undefined);
        router.refresh();
      }}
    >
      Mark booked
    </Button>
  );
}
