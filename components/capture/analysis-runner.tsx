'use client';

import clsx from 'clsx';
import { useRouter } from 'next/navigation';
import { useEffect, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { useAnalysisStatus, useStartAnalysis } from '@/lib/hooks/use-analysis';
import { useRegionDraft } from './region-editor-draft';

/**
 * "Analyse" and the live progress of the newest analysis; the page reloads its readings when it ends.
 * Region edits not yet saved are saved first, and a failed save analyses nothing.
 */
export function AnalysisRunner({
  captureSetId,
  current,
  canRun,
  ready,
  readyHint,
  outdated = null,
  photosChanged = false,
}: {
  captureSetId: string;
  current: string | null;
  canRun: boolean;
  ready: boolean;
  readyHint: string;
  /** Set when the reading shown was made by an older engine than the current one. */
  outdated?: { readingEngine: string; currentEngine: string } | null;
  /** Set when the newest reading was made before a photo was added, removed, replaced or read differently. */
  photosChanged?: boolean;
}) {
  const router = useRouter();
  const [analysisId, setAnalysisId] = useState<string | null>(current);
  const [notice, setNotice] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [savingRegions, setSavingRegions] = useState(false);
  const start = useStartAnalysis(captureSetId);
  const draft = useRegionDraft();
  const status = useAnalysisStatus(analysisId);
  const a = status.data?.analysis;
  const finished = useRef<string | null>(null);

  useEffect(() => {
    if (!a || (a.status !== 'done' && a.status !== 'failed')) return;
    if (finished.current === a.id) return;
    finished.current = a.id;
    router.refresh();
  }, [a, router]);

  const busy = savingRegions || a?.status === 'queued' || a?.status === 'running';
  const percent = a ? (a.status === 'done' ? 100 : a.progress) : 0;

  const run = async () => {
    setError(null);
    setNotice(null);
    if (draft) {
      setSavingRegions(true);
      const saved = await draft.flush();
      setSavingRegions(false);
      if (!saved.ok) {
        setError(`Nothing was analysed: the region edits could not be saved. ${saved.message}`);
        return;
      }
    }
    try {
      const out = await start.mutateAsync();
      finished.current = null;
      setAnalysisId(out.analysis.id);
      if (!out.enqueued) setNotice(out.message);
    } catch (e) {
      setError((e as Error).message);
    }
  };

  return (
    <div className="space-y-3">
      {outdated ? (
        <div className="flex flex-wrap items-center gap-3 rounded-md border border-warn/50 bg-warn/10 px-3 py-2 text-sm text-ink" data-testid="outdated-engine">
          <span>
            Measured with engine {outdated.readingEngine} — the current engine is {outdated.currentEngine}. Its numbers may differ from a new analysis of the same photos.
          </span>
          {canRun ? (
            <Button type="button" tone="quiet" disabled={!ready || start.isPending || busy} onClick={run}>
              {savingRegions ? 'Saving regions…' : busy ? 'Re-analysing…' : `Re-analyse with engine ${outdated.currentEngine}`}
            </Button>
          ) : null}
        </div>
      ) : null}
      {photosChanged && !busy ? (
        <div className="rounded-md border border-warn/50 bg-warn/10 px-3 py-2 text-sm text-ink" data-testid="photos-changed">
          The photos changed after the newest reading was made (a photo was added, removed, replaced or read differently): its numbers describe the earlier photos.{' '}
          {canRun ? 'Analyse again for a reading of these.' : 'Someone who may analyse can make a reading of these.'}
        </div>
      ) : null}
      {canRun ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button
            type="button"
            disabled={!ready || start.isPending || busy}
            onClick={run}
          >
            {savingRegions ? 'Saving regions…' : start.isPending ? 'Queuing…' : busy ? 'Analysing…' : current ? 'Analyse again' : 'Analyse'}
          </Button>
          {!ready ? <span className="text-xs text-muted">{readyHint}</span> : null}
          {ready && draft?.unsaved && !savingRegions ? (
            <span className="text-xs text-warn" data-testid="unsaved-regions-hint">
              The region edits are not saved yet: analysing saves them first.
            </span>
          ) : null}
        </div>
      ) : null}
      {savingRegions ? (
        <p role="status" className="text-sm text-ink" data-testid="saving-regions">
          Saving regions…
        </p>
      ) : null}
      {notice ? (
        <p role="status" className="rounded-md border border-warn/50 bg-warn/10 px-3 py-2 text-sm text-ink">
          {notice}
        </p>
      ) : null}
      {error ? (
        <p role="alert" className="text-sm text-fail">
          {error}
        </p>
      ) : null}
      {a ? (
        <div data-testid="analysis-progress" data-status={a.status}>
          <div className="mb-1 flex justify-between text-xs">
            <span className={clsx(a.status === 'failed' ? 'text-fail' : a.status === 'done' ? 'text-pass' : 'text-ink')}>
              {a.status === 'failed' ? 'Analysis failed' : a.stageLabel}
              {a.attempts > 1 && a.status !== 'done' ? ` (try ${a.attempts})` : ''}
            </span>
            <span className="font-mono text-muted">{percent}%</span>
          </div>
          <div className="h-2 overflow-hidden rounded bg-raised" role="progressbar" aria-label="Analysis progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={percent}>
            <div className={clsx('h-full transition-[width] duration-500', a.status === 'failed' ? 'bg-fail' : a.status === 'done' ? 'bg-pass' : 'bg-beam')} style={{ width: `${a.status === 'failed' ? 100 : percent}%` }} />
          </div>
          {a.status === 'failed' && a.error ? (
            <p role="alert" className="mt-2 text-sm text-fail" data-testid="analysis-error">
              {a.error}
            </p>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
