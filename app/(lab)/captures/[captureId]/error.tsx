'use client';

import { RouteError } from '@/components/ui/route-states';

export default function CaptureError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <RouteError title="This capture set could not be shown" reset={reset}>
      Loading it failed; your photos and readings are safe. Try again in a moment.
    </RouteError>
  );
}
