'use client';

import { Button } from '@/components/ui/button';

export default function CompareError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="mx-auto max-w-lg rounded-lg border border-fail/40 bg-fail/5 p-6">
      <h2 className="font-semibold text-fail">This comparison could not be shown</h2>
      <p className="mt-2 text-sm text-muted">Loading it failed; nothing was changed. Try again in a moment.</p>
      <Button className="mt-4" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}
