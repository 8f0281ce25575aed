'use client';

import { RouteError } from '@/components/ui/route-states';

export default function LabError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <RouteError title="This page could not be shown" reset={reset}>
      Something failed while loading it. Your data is safe. Try again; if it keeps failing, tell your lab admin.
    </RouteError>
  );
}
