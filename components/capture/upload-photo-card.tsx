'use client';

import { useRouter } from 'next/navigation';
import { useRef, useState } from 'react';
import { apiJson } from '@/lib/hooks/api';
import { PHOTO_ACCEPT_ATTRIBUTE } from '@/lib/image/raw-formats';
import { ROLE_LABELS, type PhotoRole } from '@/lib/schemas/upload';
import { removeQuestion } from './upload-queue';

/** A stored photo's thumbnail, from the authorised, cached thumbnail route. */
export function PhotoThumbnail({ captureSetId, photo }: { captureSetId: string; photo: { id: string; role: PhotoRole; originalName: string; width: number; height: number } }) {
  const [failed, setFailed] = useState(false);
  const landscape = photo.width >= photo.height;
  const width = landscape ? 96 : Math.round((96 * photo.width) / photo.height);
  const height = landscape ? Math.round((96 * photo.height) / photo.width) : 96;
  if (failed) {
    return (
      <div style={{ width, height }} className="flex shrink-0 items-center justify-center rounded border border-line bg-raised p-1 text-center text-[10px] text-muted" data-testid={`thumb-${photo.role}`}>
        no preview
      </div>
    );
  }
  return (
    // eslint-disable-next-line @next/next/no-img-element -- a private, session-bound image; next/image would cache it publicly
    <img
      src={`/api/captures/${captureSetId}/photos/${photo.id}/thumbnail`}
      alt={`Thumbnail of ${photo.originalName || `the ${photo.role} photo`}`}
      width={width}
      height={height}
      onError={() => setFailed(true)}
      loading="lazy"
      decoding="async"
      className="shrink-0 rounded border border-line bg-black object-contain"
      data-testid={`thumb-${photo.role}`}
    />
  );
}

/**
 * Replace and Remove for one stored photo. Clicks and keys stay here: the slot around it opens its
 * file picker on both. Replace hands the picked file to the upload list (progress and errors
 * show there); Remove asks first.
 */
export function PhotoActions({ captureSetId, photo, onReplace }: { captureSetId: string; photo: { id: string; role: PhotoRole; originalName: string }; onReplace: (file: File) => void }) {
  const router = useRouter();
  const input = useRef<HTMLInputElement>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const name = photo.originalName || `the ${photo.role} photo`;

  const remove = async () => {
    if (!window.confirm(removeQuestion(photo, ROLE_LABELS[photo.role]))) return;
    setBusy(true);
    setError(null);
    try {
      await apiJson(`/api/captures/${captureSetId}/photos/${photo.id}`, { method: 'DELETE' });
      router.refresh();
    } catch (e) {
      setError(`${name} was not removed: ${(e as Error).message}`);
    } finally {
      setBusy(false);
    }
  };

  return (
    <div onClick={(e) => e.stopPropagation()} onKeyDown={(e) => e.stopPropagation()} className="space-y-1">
      <div className="flex flex-wrap gap-2">
        <button type="button" className="rounded border border-line px-2 py-0.5 text-ink hover:border-beam disabled:opacity-50" disabled={busy} onClick={() => input.current?.click()} aria-label={`Replace ${name}`}>
          Replace…
        </button>
        <button type="button" className="rounded border border-fail/50 px-2 py-0.5 text-fail hover:bg-fail/10 disabled:opacity-50" disabled={busy} onClick={remove} aria-label={`Remove ${name}`}>
          {busy ? 'Removing…' : 'Remove'}
        </button>
        <input
          ref={input}
          type="file"
          accept={PHOTO_ACCEPT_ATTRIBUTE}
          className="hidden"
          data-testid={`replace-input-${photo.id}`}
          onChange={(e) => {
            const file = e.target.files?.[0];
            e.target.value = '';
            if (file) onReplace(file);
          }}
        />
      </div>
      {error ? (
        <p role="alert" className="text-fail">
          {error}
        </p>
      ) : null}
    </div>
  );
}
