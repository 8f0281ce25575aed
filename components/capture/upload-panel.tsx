'use client';

import clsx from 'clsx';
import { useRouter } from 'next/navigation';
import { useCallback, useState } from 'react';
import { useDropzone } from 'react-dropzone';
import { apiJson } from '@/lib/hooks/api';
import { PHOTO_ACCEPT, RAW_LIST } from '@/lib/image/raw-formats';
import { replacePhoto, uploadPhoto } from '@/lib/hooks/upload-photo';
import { photoEncoding, type TiffEncodingSetting } from '@/lib/schemas/capture-set';
import { MAX_UPLOAD_BYTES, PHOTO_ROLES, ROLE_HINTS, ROLE_LABELS, roleFromFileName, type PhotoRole } from '@/lib/schemas/upload';
import { PhotoActions, PhotoThumbnail } from './upload-photo-card';
import { canDismiss, dismissItem, mergeQueue, retryItem, sendOrder, type UploadItem } from './upload-queue';

export type PhotoCard = {
  id: string;
  role: PhotoRole;
  originalName: string;
  width: number;
  height: number;
  bytes: number;
  format: string;
  bitDepth: number;
  encodingFile: 'linear' | 'srgb' | null;
  encodingReason: string;
  encodingDeclared: 'linear' | 'srgb' | null;
  pages: number;
  exif: { exposureTime?: number; fNumber?: number; iso?: number; make?: string; model?: string; lens?: string; takenAt?: string };
};

type Item = UploadItem<File>;

const mb = (n: number) => `${(n / 1048576).toFixed(n < 10 * 1048576 ? 1 : 0)} MB`;

function shutter(t?: number): string | null {
  if (!t) return null;
  return t >= 1 ? `${t} s` : `1/${Math.round(1 / t)} s`;
}

/** The EXIF line a tester checks: exposure triangle and camera; missing tags are said out loud. */
export function exifLine(e: PhotoCard['exif']): string {
  const parts = [shutter(e.exposureTime), e.fNumber ? `f/${e.fNumber}` : null, e.iso ? `ISO ${e.iso}` : null].filter(Boolean);
  const cam = [e.make, e.model].filter(Boolean).join(' ');
  if (parts.length === 0) return `No exposure tags${cam ? ` · ${cam}` : ''}: exposures will be assumed equal`;
  return `${parts.join(' · ')}${cam ? ` · ${cam}` : ''}`;
}

export function UploadPanel({ captureSetId, photos, canWrite, tiffEncoding = 'auto' }: { captureSetId: string; photos: PhotoCard[]; canWrite: boolean; tiffEncoding?: TiffEncodingSetting }) {
  const router = useRouter();
  const [items, setItems] = useState<Item[]>([]);
  // several photos of a role at different exposures form a bracket
  const ofRole = (role: PhotoRole) => photos.filter((p) => p.role === role);

  const patch = (key: string, p: Partial<Item>) => setItems((all) => all.map((i) => (i.key === key ? { ...i, ...p } : i)));

  const send = useCallback(
    async (batch: Item[]) => {
      // one after another: the set's size check compares each photo with the ones already stored
      let any = false;
      for (const item of batch) {
        if (!item.role) continue;
        if (item.file.size > MAX_UPLOAD_BYTES) {
          patch(item.key, { state: 'refused', message: `${item.name} is ${mb(item.file.size)}; the limit is 60 MB a photo: export a JPEG at high quality or a compressed TIFF.` });
          continue;
        }
        patch(item.key, { state: 'sending', progress: 0, message: undefined });
        const onProgress = (f: number) => patch(item.key, { progress: f });
        const out = item.replaces ? await replacePhoto(captureSetId, item.replaces.id, item.file, onProgress) : await uploadPhoto(captureSetId, item.role, item.file, onProgress);
        if (out.ok) {
          any = true;
          patch(item.key, { state: 'done', progress: 1, message: out.duplicate ? 'Already uploaded: kept as it is.' : item.replaces ? `Uploaded in place of ${item.replaces.name}.` : 'Uploaded.' });
        } else patch(item.key, { state: 'refused', message: out.message });
      }
      if (any) router.refresh();
    },
    [captureSetId, router],
  );

  const enqueue = useCallback(
    (files: File[], role: PhotoRole | 'auto') => {
      const batch: Item[] = files.map((file, k) => ({
        key: `${Date.now()}-${k}-${file.name}`,
        name: file.name,
        role: role === 'auto' ? roleFromFileName(file.name) : role,
        progress: 0,
        state: 'waiting',
        file,
      }));
      // on first: later photos are checked against its size; refused files stay listed
      const ordered = sendOrder(batch);
      setItems((all) => mergeQueue(all, ordered));
      void send(ordered);
    },
    [send],
  );

  const replace = (photo: PhotoCard, file: File) => {
    const item: Item = { key: `${Date.now()}-replace-${photo.id}`, name: file.name, role: photo.role, progress: 0, state: 'waiting', file, replaces: { id: photo.id, name: photo.originalName || `the ${photo.role} photo` } };
    setItems((all) => mergeQueue(all, [item]));
    void send([item]);
  };

  const retry = (item: Item) => {
    const again = retryItem(item);
    if (!again) return;
    setItems((all) => mergeQueue(all, [again]));
    void send([again]);
  };

  const assign = (item: Item, role: PhotoRole) => {
    const next = { ...item, role };
    patch(item.key, { role });
    void send([next]);
  };

  return (
    <div className="space-y-4">
      {canWrite ? <MultiDrop onFiles={(f) => enqueue(f, 'auto')} /> : null}
      <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
        {PHOTO_ROLES.map((role) => (
          <RoleSlot key={role} role={role} photos={ofRole(role)} captureSetId={captureSetId} canWrite={canWrite} tiffEncoding={tiffEncoding} onFiles={(f) => enqueue(f, role)} onReplace={replace} />
        ))}
      </div>
      {items.length ? (
        <ul className="space-y-2" aria-label="Uploads">
          {items.map((i) => (
            <li key={i.key} data-testid="upload-item" className="rounded-md border border-line bg-canvas px-3 py-2 text-sm">
              <div className="flex flex-wrap items-center justify-between gap-2">
                <span className="font-mono text-xs text-ink">{i.name}</span>
                <span className="flex items-center gap-2 text-xs text-muted">
                  {i.role ? ROLE_LABELS[i.role] : 'Role?'}
                  {i.replaces ? <span> · replaces {i.replaces.name}</span> : null}
                  {i.state === 'refused' && i.role ? (
                    <button type="button" onClick={() => retry(i)} className="rounded border border-line px-2 py-0.5 text-ink hover:border-beam">
                      Try again
                    </button>
                  ) : null}
                  {canDismiss(i) ? (
                    <button type="button" onClick={() => setItems((all) => dismissItem(all, i.key))} className="rounded border border-line px-2 py-0.5 text-ink hover:border-beam" aria-label={`Dismiss ${i.name}`}>
                      Dismiss
                    </button>
                  ) : null}
                </span>
              </div>
              {i.role === null && i.state === 'waiting' ? (
                <div className="mt-2 flex flex-wrap items-center gap-2 text-xs">
                  <span className="text-warn">The name does not say which photo this is:</span>
                  {PHOTO_ROLES.map((r) => (
                    <button key={r} type="button" onClick={() => assign(i, r)} className="rounded border border-line px-2 py-0.5 text-ink hover:border-beam">
                      {ROLE_LABELS[r]}
                    </button>
                  ))}
                </div>
              ) : null}
              {i.state === 'sending' || i.state === 'done' ? (
                <div className="mt-2 h-1.5 overflow-hidden rounded bg-raised" role="progressbar" aria-label={`Upload of ${i.name}`} aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(i.progress * 100)}>
                  <div className={clsx('h-full transition-[width]', i.state === 'done' ? 'bg-pass' : 'bg-beam')} style={{ width: `${Math.round(i.progress * 100)}%` }} />
                </div>
              ) : null}
              {i.message ? (
                <p role={i.state === 'refused' ? 'alert' : 'status'} className={clsx('mt-1 text-xs', i.state === 'refused' ? 'text-fail' : 'text-pass')}>
                  {i.message}
                </p>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

function MultiDrop({ onFiles }: { onFiles: (files: File[]) => void }) {
  // the picker offers photos and camera raw files; a dropped file of another type still goes to the
  // server, whose refusal says what to send instead
  const { getRootProps, getInputProps, isDragActive } = useDropzone({ onDrop: onFiles, onDropRejected: (r) => onFiles(r.map((x) => x.file)), accept: PHOTO_ACCEPT, multiple: true });
  return (
    <div
      {...getRootProps({
        'aria-label': 'Drop several photos',
        className: clsx('cursor-pointer rounded-lg border-2 border-dashed px-4 py-5 text-center text-sm', isDragActive ? 'border-beam bg-beam/10' : 'border-line hover:border-beam/60'),
      })}
      data-testid="multi-drop"
    >
      <input {...getInputProps()} data-testid="multi-drop-input" />
      <p className="text-ink">Drop the whole set here</p>
      <p className="mt-1 text-xs text-muted">Roles come from the file names: on / display-on, off, ambient / world / no-optics, dark. Up to 60 MB a photo; camera raw ({RAW_LIST}), JPEG, PNG, TIFF (16-bit welcome) or WebP.</p>
      <p className="mt-1 text-xs text-muted" data-testid="raw-best">
        Raw is best: upload the camera’s raw files as they are, no conversion step. They are decoded to linear light, every raw photo of the set with the same fixed white balance. A 16-bit TIFF with no colour profile or a linear one is read as linear; one with an sRGB or other gamma profile as gamma-encoded. Each photo below says how it is read and can be changed.
      </p>
    </div>
  );
}

function RoleSlot({
  role,
  photos,
  captureSetId,
  canWrite,
  onFiles,
  onReplace,
  tiffEncoding,
}: {
  role: PhotoRole;
  photos: PhotoCard[];
  captureSetId: string;
  canWrite: boolean;
  onFiles: (files: File[]) => void;
  onReplace: (photo: PhotoCard, file: File) => void;
  tiffEncoding: TiffEncodingSetting;
}) {
  const { getRootProps, getInputProps, isDragActive } = useDropzone({ onDrop: onFiles, onDropRejected: (r) => onFiles(r.map((x) => x.file)), accept: PHOTO_ACCEPT, multiple: true, disabled: !canWrite, noClick: !canWrite });
  const bracket = photos.length;
  return (
    <div
      {...getRootProps({
        className: clsx('rounded-lg border bg-canvas p-3 text-sm', isDragActive ? 'border-beam bg-beam/10' : bracket ? 'border-line' : 'border-dashed border-line', canWrite && 'cursor-pointer hover:border-beam/60'),
      })}
      data-testid={`slot-${role}`}
    >
      {canWrite ? <input {...getInputProps()} data-testid={`slot-${role}-input`} /> : null}
      <div className="flex items-baseline justify-between gap-2">
        <span className="font-semibold text-ink">{ROLE_LABELS[role]}</span>
        <span className="text-[10px] uppercase tracking-wider text-muted">
          {role}
          {bracket > 1 ? <span data-testid={`bracket-${role}`}> · bracket of {bracket}</span> : null}
        </span>
      </div>
      {photos.length ? (
        <ul className="mt-2 space-y-3">
          {photos.map((photo) => (
            <li key={photo.id} className="space-y-1 text-xs" data-testid={`photo-${role}`} data-photo-id={photo.id}>
              <div className="flex gap-2">
                <PhotoThumbnail captureSetId={captureSetId} photo={photo} />
                <div className="min-w-0 flex-1 space-y-1 [contain:inline-size]">
                  <div className="truncate font-mono text-ink" title={photo.originalName}>
                    {photo.originalName}
                  </div>
                  <div className="text-muted">
                    {photo.width} × {photo.height} · {photo.format.toUpperCase()} {photo.bitDepth}-bit · {mb(photo.bytes)}
                  </div>
                  <div className="text-muted" data-testid={`exif-${role}`}>
                    {exifLine(photo.exif)}
                  </div>
                </div>
              </div>
              <EncodingLine photo={photo} captureSetId={captureSetId} canWrite={canWrite} tiffEncoding={tiffEncoding} />
              {photo.pages > 1 ? (
                <div className="text-warn" data-testid={`pages-${role}`}>
                  This TIFF holds {photo.pages} pages: only the first is measured. Export the view you mean as a single-page file if that is not it.
                </div>
              ) : null}
              <div className="flex flex-wrap items-center gap-3">
                <a href={`/api/captures/${captureSetId}/photos/${photo.id}/original`} onClick={(e) => e.stopPropagation()} className="text-beam hover:underline">
                  Download original
                </a>
                {canWrite ? <PhotoActions captureSetId={captureSetId} photo={photo} onReplace={(file) => onReplace(photo, file)} /> : null}
              </div>
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-2 text-xs text-muted">{ROLE_HINTS[role]}{canWrite ? ' — drop or click to pick.' : '.'}</p>
      )}
    </div>
  );
}

const ENCODING_TEXT = { linear: 'Read as linear light', srgb: 'Read as sRGB-encoded' } as const;

/** How the photo's values are read, who decided it, and (16-bit TIFFs only) a choice to override it. */
function EncodingLine({ photo, captureSetId, canWrite, tiffEncoding }: { photo: PhotoCard; captureSetId: string; canWrite: boolean; tiffEncoding: TiffEncodingSetting }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const d = photoEncoding(tiffEncoding, { ...photo, role: photo.role });
  const sixteenTiff = photo.format === 'tiff' && photo.bitDepth === 16;
  const why =
    d.by === 'photo'
      ? 'set for this photo'
      : d.by === 'set'
        ? 'as the capture set says'
        : photo.encodingFile === null
          ? 'uploaded before files were asked: the earlier reading'
          : `file: ${photo.encodingReason}`;
  return (
    <div className="space-y-1" data-testid={`encoding-${photo.role}`} data-linear={d.linear ? 'true' : 'false'}>
      {d.conflict ? (
        <p role="alert" className="text-fail">
          {d.conflict}.
        </p>
      ) : (
        <div className={d.linear ? 'text-pass' : 'text-muted'}>
          {ENCODING_TEXT[d.linear ? 'linear' : 'srgb']} <span className="text-muted">({why})</span>
        </div>
      )}
      {canWrite && sixteenTiff ? (
        // clicks and keys stay here: the slot around it opens the file picker on both
        <label className="flex items-center gap-1 text-muted" onClick={(e) => e.stopPropagation()} onKeyDown={(e) => e.stopPropagation()}>
          <span>This photo:</span>
          <select
            aria-label={`Encoding of the ${photo.role} photo`}
            value={photo.encodingDeclared ?? 'auto'}
            disabled={busy}
            className="rounded border border-line bg-canvas px-1 py-0.5 text-ink"
            onChange={async (e) => {
              const v = e.target.value;
              setBusy(true);
              setError(null);
              try {
                await apiJson(`/api/captures/${captureSetId}/photos/${photo.id}`, { method: 'PATCH', body: JSON.stringify({ encoding: v === 'auto' ? null : v }) });
                router.refresh();
              } catch (err) {
                setError((err as Error).message);
              } finally {
                setBusy(false);
              }
            }}
          >
            <option value="auto">as the set says</option>
            <option value="linear">linear 16-bit</option>
            <option value="srgb">sRGB-encoded</option>
          </select>
        </label>
      ) : null}
      {error ? (
        <p role="alert" className="text-fail">
          {error}
        </p>
      ) : null}
    </div>
  );
}
