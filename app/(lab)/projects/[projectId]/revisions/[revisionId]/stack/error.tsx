'use client';

import { RouteError } from '@/components/ui/route-states';

export default function StackError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <RouteError title="The stack planner could not be shown" reset={reset}>
      Loading the stack or its readings failed. The saved stack is unchanged. Try again; if it keeps failing, tell your lab admin.
    </RouteError>
  );
}
