'use client';

import { useMutation, useQuery } from '@tanstack/react-query';
import { apiJson } from './api';

export type AnalysisStatusBody = {
  analysis: { id: string; status: 'queued' | 'running' | 'done' | 'failed'; progress: number; stage: string; stageLabel: string; error: string | null; attempts: number };
  reading: { id: string; ambientContrastRatio: number | null; warningCount: number } | null;
};

const POLL_MS = 700;

/** Polls an analysis until it is done or failed; the interval stops by itself then. */
export function useAnalysisStatus(analysisId: string | null) {
  return useQuery({
    queryKey: ['analysis', analysisId],
    queryFn: () => apiJson<AnalysisStatusBody>(`/api/analyses/${analysisId}`),
    enabled: !!analysisId,
    refetchInterval: (q) => {
      const s = q.state.data?.analysis.status;
      return s === 'done' || s === 'failed' ? false : POLL_MS;
    },
  });
}

export type StartAnalysisBody = { analysis: { id: string; status: string }; enqueued: boolean; message: string };

export function useStartAnalysis(captureSetId: string) {
  return useMutation({
    mutationFn: () => apiJson<StartAnalysisBody>(`/api/captures/${captureSetId}/analyses`, { method: 'POST', body: '{}' }),
  });
}
