'use client';

import { useMutation, useQuery } from '@tanstack/react-query';
import type { RegionKind } from '@/lib/schemas/region';
import { apiJson } from './api';

export type EditableRegion = { kind: RegionKind; x: number; y: number; w: number; h: number; source: 'marked' | 'detected' | 'template' };
export type TemplateSummary = { id: string; name: string; imageWidth: number; imageHeight: number };

export function useSaveRegions(captureSetId: string) {
  return useMutation({
    mutationFn: (regions: EditableRegion[]) => apiJson<{ regions: EditableRegion[] }>(`/api/captures/${captureSetId}/regions`, { method: 'PUT', body: JSON.stringify({ regions }) }),
  });
}

export function useDetectScreen(captureSetId: string) {
  return useMutation({
    mutationFn: () => apiJson<{ screen: EditableRegion }>(`/api/captures/${captureSetId}/detect`, { method: 'POST', body: '{}' }),
  });
}

export function useTemplates(captureSetId: string) {
  return useQuery({ queryKey: ['templates', captureSetId], queryFn: () => apiJson<{ templates: TemplateSummary[] }>(`/api/captures/${captureSetId}/templates`) });
}

export function useSaveTemplate(captureSetId: string) {
  return useMutation({
    mutationFn: (name: string) => apiJson<{ template: TemplateSummary }>(`/api/captures/${captureSetId}/templates`, { method: 'POST', body: JSON.stringify({ name }) }),
  });
}

export function useApplyTemplate(captureSetId: string) {
  return useMutation({
    mutationFn: (templateId: string) => apiJson<{ regions: EditableRegion[] }>(`/api/captures/${captureSetId}/templates/apply`, { method: 'POST', body: JSON.stringify({ templateId }) }),
  });
}
