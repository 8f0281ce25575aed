'use client';

import { RouteError } from '@/components/ui/route-states';

export default function RevisionError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <RouteError title="This revision could not be shown" reset={reset}>
      Loading it failed; nothing was changed. Try again in a moment.
    </RouteError>
  );
}
