'use client';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';

export default function InvoicesError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col gap-3">
      <Alert tone="error" title="The invoices could not be loaded">Nothing was changed. Try again in a moment.</Alert>
      <div>
        <Button onClick={reset}>Try again</Button>
      </div>
    </div>
  );
}
