'use client';

import Link from 'next/link';
import { Button } from './button';

/** What an error.tsx shows: what failed, that nothing was lost, and a retry. */
export function RouteError({ title, children, reset }: { title: string; children: React.ReactNode; reset: () => void }) {
  return (
    <div className="mx-auto max-w-lg rounded-lg border border-fail/40 bg-fail/5 p-6">
      <h2 className="font-semibold text-fail">{title}</h2>
      <p className="mt-2 text-sm text-muted">{children}</p>
      <Button className="mt-4" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}

/** What a not-found.tsx shows: the record is gone or belongs to another lab (we never say which). */
export function MissingRecord({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <div className="mx-auto max-w-lg py-16 text-center">
      <h2 className="text-lg font-semibold">{title}</h2>
      <p className="mt-2 text-sm text-muted">{children}</p>
      <Link href="/projects" className="mt-4 inline-block text-sm text-beam">
        All projects
      </Link>
    </div>
  );
}
