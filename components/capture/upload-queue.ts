/**
 * The upload list's rules as plain functions: which entries a new drop keeps, how a photo is
 * replaced, and what each entry says. A refused file stays listed with its message until the
 * tester dismisses it or tries it again; the next drop does not wipe it.
 */
import type { PhotoRole } from '@/lib/schemas/upload';

export type UploadState = 'waiting' | 'sending' | 'done' | 'refused';

export type UploadItem<F = unknown> = {
  key: string;
  name: string;
  role: PhotoRole | null;
  progress: number;
  state: UploadState;
  message?: string;
  file: F;
  /** Set when the file replaces a stored photo: its id and name. */
  replaces?: { id: string; name: string };
};

/** Entries that still need the tester: sending, refused (until dismissed or retried), or waiting for a role. */
export function needsAttention(i: UploadItem): boolean {
  return i.state === 'sending' || i.state === 'refused' || (i.state === 'waiting' && i.role === null);
}

/**
 * The list after a drop: the new files first, then the earlier entries that still need the
 * tester. Finished uploads make room; refused ones and those waiting for a role stay.
 */
export function mergeQueue<F>(all: readonly UploadItem<F>[], batch: readonly UploadItem<F>[]): UploadItem<F>[] {
  const fresh = new Set(batch.map((b) => b.key));
  return [...batch, ...all.filter((i) => !fresh.has(i.key) && needsAttention(i))];
}

/** Whether an entry can be dismissed: finished, refused, or waiting for a role (never one being sent). */
export function canDismiss(i: UploadItem): boolean {
  return i.state === 'done' || i.state === 'refused' || (i.state === 'waiting' && i.role === null);
}

/** The list without the dismissed entry, when it can be dismissed. */
export function dismissItem<F>(all: readonly UploadItem<F>[], key: string): UploadItem<F>[] {
  return all.filter((i) => i.key !== key || !canDismiss(i));
}

/** The entry set back to be sent again, its message cleared; null when it cannot be retried (not refused, or no role). */
export function retryItem<F>(i: UploadItem<F>): UploadItem<F> | null {
  if (i.state !== 'refused' || !i.role) return null;
  const { message: _m, ...rest } = i;
  return { ...rest, state: 'waiting', progress: 0 };
}

// a set's size check compares each photo with those already stored, so the on photo goes first
const ORDER: Record<PhotoRole, number> = { on: 0, off: 1, ambient: 2, dark: 3 };

/** The order a batch is sent in: on, off, ambient, dark, files without a role last. */
export function sendOrder<F>(batch: readonly UploadItem<F>[]): UploadItem<F>[] {
  return [...batch].sort((a, b) => (a.role ? ORDER[a.role] : 9) - (b.role ? ORDER[b.role] : 9));
}

/** The confirmation asked before a photo is removed. */
export function removeQuestion(p: { originalName: string; role: PhotoRole }, roleLabel: string): string {
  const name = p.originalName || `the ${p.role} photo`;
  return `Remove ${name} (${roleLabel.toLowerCase()})? The file is deleted. Readings made from it are kept and marked as made from photos that have since changed.`;
}
