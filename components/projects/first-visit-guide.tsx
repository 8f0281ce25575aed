'use client';

import Link from 'next/link';
import { useState } from 'react';
import { REPORT_CAUTIONS } from '@/lib/reports/cautions';
import { GUIDE_COOKIE } from './guide-cookie';

const STEPS: { title: string; body: React.ReactNode }[] = [
  { title: 'Create a project', body: 'One per device or design you measure, e.g. “Visor V2 birdbath”.' },
  { title: 'Add a revision', body: 'Each build or prototype of it (“P1”, “P2 with AR coat”): trends and targets follow the revisions.' },
  { title: 'Add a capture set', body: 'One measuring situation: the pattern, the room’s light and, for an A/B, a variant such as “with polarizer”.' },
  {
    title: 'Photograph on, off and ambient',
    body: (
      <>
        Camera on a tripod at the eye point, manual exposure and focus. <strong className="text-ink">On</strong>: the display shows the test pattern (from <Link href="/patterns" className="text-beam hover:underline">Test patterns</Link>);{' '}
        <strong className="text-ink">off</strong>: the display dark, nothing else moved; <strong className="text-ink">ambient</strong> (for transmission): the same scene with the optics out of the path.
      </>
    ),
  },
  { title: 'Mark the regions', body: 'Screen, background and, if you see one, the ghost, on the on photo; or let the analysis find them.' },
  { title: 'Analyse', body: 'Contrast ratio, ghost, see-through transmission, tint and uniformity, each with what it means.' },
  { title: 'Compare and follow trends', body: 'Variants and revisions side by side with their uncertainty, and each revision judged against the team’s targets.' },
];

/**
 * A short guide to the capture flow for a lab with no projects yet. Dismissing it sets a cookie for
 * a year; the page stops showing it once a project exists anyway.
 */
export function FirstVisitGuide({ canCreate }: { canCreate: boolean }) {
  const [open, setOpen] = useState(true);
  if (!open) return null;
  const dismiss = () => {
    document.cookie = `${GUIDE_COOKIE}=dismissed; path=/; max-age=31536000; samesite=lax`;
    setOpen(false);
  };
  return (
    <section aria-labelledby="guide-title" data-testid="first-visit-guide" className="mb-6 rounded-lg border border-beam/40 bg-beam/5 p-4 sm:p-5">
      <div className="flex items-start justify-between gap-3">
        <div>
          <h2 id="guide-title" className="text-base font-semibold text-ink">
            How a measurement goes
          </h2>
          <p className="mt-1 text-sm text-muted">Seven steps from an empty lab to a decision; each page says more when you get there.</p>
        </div>
        <button type="button" onClick={dismiss} className="shrink-0 rounded-md px-2 py-1 text-sm text-muted hover:text-ink" aria-label="Dismiss the guide">
          Dismiss
        </button>
      </div>
      <ol className="mt-4 grid gap-3 text-sm sm:grid-cols-2 xl:grid-cols-4">
        {STEPS.map((s, i) => (
          <li key={s.title} className="flex gap-3">
            <span aria-hidden className="flex h-6 w-6 shrink-0 items-center justify-center rounded-full border border-beam/60 font-mono text-xs text-beam">
              {i + 1}
            </span>
            <div className="min-w-0">
              <p className="font-medium text-ink">{s.title}</p>
              <p className="text-muted">{s.body}</p>
            </div>
          </li>
        ))}
      </ol>
      <div className="mt-4 rounded-md border border-warn/50 bg-warn/10 p-3 text-sm" role="note" aria-label="Cautions">
        <p className="mb-1 text-xs font-semibold uppercase tracking-[0.16em] text-warn">Take care</p>
        <ul className="list-disc space-y-1 pl-5 text-ink">
          {REPORT_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </div>
      <div className="mt-4 flex flex-wrap items-center gap-3">
        {canCreate ? (
          <a href="#new-project" className="inline-flex items-center rounded-md bg-beam px-3 py-1.5 text-sm font-semibold text-canvas hover:bg-beam/85" onClick={() => setTimeout(() => document.querySelector<HTMLInputElement>('#new-project input[name="name"]')?.focus(), 0)}>
            Create your first project
          </a>
        ) : (
          <>
            <p className="text-sm text-muted">A lead or admin of this lab creates projects; meanwhile the test patterns are ready to show.</p>
            <Link href="/patterns" className="inline-flex items-center rounded-md bg-beam px-3 py-1.5 text-sm font-semibold text-canvas hover:bg-beam/85">
              Open the test patterns
            </Link>
          </>
        )}
      </div>
    </section>
  );
}
