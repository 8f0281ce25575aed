'use client';

import { useMutation, useQuery } from '@tanstack/react-query';
import clsx from 'clsx';
import { useRouter } from 'next/navigation';
import { useEffect, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { apiJson } from '@/lib/hooks/api';

export type BatchBody = {
  id: string;
  projectId: string;
  revisionId: string | null;
  engineVersion: string;
  total: number;
  done: number;
  failed: number;
  inFlight: number;
  waiting: number;
  failures: { captureSetId: string; label: string; error: string }[];
  finished: boolean;
};

const POLL_MS = 1500;

/** Polls a re-analysis batch until every capture set in it is done or failed. */
export function useReanalysis(batchId: string | null) {
  return useQuery({
    queryKey: ['reanalysis', batchId],
    queryFn: () => apiJson<{ batch: BatchBody }>(`/api/captures/reanalyses/${batchId}`),
    enabled: !!batchId,
    refetchInterval: (q) => (q.state.data?.batch.finished ? false : POLL_MS),
  });
}

export function useStartReanalysis(projectId: string) {
  return useMutation({
    mutationFn: (revisionId: string | null) => apiJson<{ batch: BatchBody | null; message: string }>('/api/captures/reanalyses', { method: 'POST', body: JSON.stringify({ projectId, revisionId }) }),
  });
}

/**
 * Readings made by an older engine, and one action to analyse them again with the current one
 * (this revision's, or the whole project's), with the batch's progress polled until it ends.
 */
export function ReanalysePanel({
  projectId,
  revisionId,
  currentEngine,
  outdated,
  canRun,
  openBatch,
}: {
  projectId: string;
  revisionId: string;
  currentEngine: string;
  /** Capture sets whose newest reading an older engine made, here and in the whole project, with those engines. */
  outdated: { revision: number; project: number; versions: string[] };
  canRun: boolean;
  openBatch: BatchBody | null;
}) {
  const router = useRouter();
  const [batchId, setBatchId] = useState<string | null>(openBatch?.id ?? null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'bad'; text: string } | null>(null);
  const start = useStartReanalysis(projectId);
  const poll = useReanalysis(batchId);
  const batch = poll.data?.batch ?? (openBatch && openBatch.id === batchId ? openBatch : null);
  const refreshed = useRef<string | null>(null);

  useEffect(() => {
    if (!batch?.finished || refreshed.current === batch.id) return;
    refreshed.current = batch.id;
    router.refresh();
  }, [batch, router]);

  const go = async (scope: string | null) => {
    setMessage(null);
    try {
      const out = await start.mutateAsync(scope);
      if (out.batch) setBatchId(out.batch.id);
      setMessage({ tone: 'ok', text: out.message });
    } catch (e) {
      setMessage({ tone: 'bad', text: (e as Error).message });
    }
  };

  const running = !!batch && !batch.finished;
  const finishedCount = batch ? batch.done + batch.failed : 0;
  const percent = batch && batch.total ? Math.round((100 * finishedCount) / batch.total) : 0;

  return (
    <div className="space-y-3" data-testid="reanalyse-panel">
      {outdated.project > 0 ? (
        <p className="text-sm text-ink" data-testid="outdated-summary">
          {outdated.revision} capture set{outdated.revision === 1 ? '' : 's'} of this revision ({outdated.project} in the whole project) {outdated.project === 1 && outdated.revision <= 1 ? 'was' : 'were'} measured with an older engine (
          {outdated.versions.join(', ')}); the current engine is {currentEngine}. Their numbers may differ from a new analysis of the same photos.
        </p>
      ) : (
        <p className="text-sm text-muted" data-testid="outdated-none">
          Every reading in this project was made with the current engine, {currentEngine}.
        </p>
      )}
      {canRun && outdated.project > 0 ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="button" disabled={start.isPending || running || outdated.revision === 0} onClick={() => go(revisionId)}>
            {`Re-analyse this revision (${outdated.revision})`}
          </Button>
          <Button type="button" tone="quiet" disabled={start.isPending || running} onClick={() => go(null)}>
            {`Re-analyse the whole project (${outdated.project})`}
          </Button>
        </div>
      ) : null}
      {message ? (
        <p role={message.tone === 'ok' ? 'status' : 'alert'} className={clsx('text-sm', message.tone === 'ok' ? 'text-pass' : 'text-fail')}>
          {message.text}
        </p>
      ) : null}
      {batch ? (
        <div data-testid="reanalyse-progress" data-finished={batch.finished ? 'true' : 'false'}>
          <div className="mb-1 flex justify-between text-xs">
            <span className={clsx(batch.finished ? (batch.failed ? 'text-warn' : 'text-pass') : 'text-ink')} data-testid="reanalyse-count">
              {finishedCount} of {batch.total} done with engine {batch.engineVersion}
              {batch.failed ? ` · ${batch.failed} failed` : ''}
              {!batch.finished && batch.waiting ? ` · ${batch.waiting} waiting for room in the lab’s queue (keep this page open)` : ''}
            </span>
            <span className="font-mono text-muted">{percent}%</span>
          </div>
          <div className="h-2 overflow-hidden rounded bg-raised" role="progressbar" aria-label="Re-analysis progress" aria-valuemin={0} aria-valuemax={batch.total} aria-valuenow={finishedCount}>
            <div className={clsx('h-full transition-[width] duration-500', batch.finished ? (batch.failed ? 'bg-warn' : 'bg-pass') : 'bg-beam')} style={{ width: `${percent}%` }} />
          </div>
          {batch.failures.length ? (
            <ul className="mt-2 space-y-1 text-xs text-fail" role="alert">
              {batch.failures.map((f) => (
                <li key={f.captureSetId}>
                  <a href={`/captures/${f.captureSetId}`} className="underline">
                    {f.label}
                  </a>
                  : {f.error}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
