'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { Field } from '@/components/ui/field';
import { Notice } from '@/components/ui/panel';
import { RectMarker, type MarkedRect } from './rect-marker';

type ApiError = { error?: { message?: string; fieldErrors?: Record<string, string[]> } };

/** An object URL of the chosen file for the preview, the previous one released. */
function usePreview(): [string | null, (file: File | null) => void] {
  const [url, setUrl] = useState<string | null>(null);
  const pick = (file: File | null) =>
    setUrl((prev) => {
      if (prev) URL.revokeObjectURL(prev);
      return file ? URL.createObjectURL(file) : null;
    });
  return [url, pick];
}

function RectFields({ rect, onRect, errors }: { rect: MarkedRect | null; onRect: (r: MarkedRect) => void; errors?: Record<string, string[]> }) {
  const set = (k: keyof MarkedRect) => (e: React.ChangeEvent<HTMLInputElement>) => onRect({ ...(rect ?? { x: 0, y: 0, w: 0, h: 0 }), [k]: Number(e.target.value) });
  return (
    <div className="grid grid-cols-4 gap-2">
      {(['x', 'y', 'w', 'h'] as const).map((k) => (
        <Field key={k} label={k} name={k} type="number" min={k === 'w' || k === 'h' ? 1 : 0} value={rect ? String(rect[k]) : ''} onChange={set(k)} errors={errors?.[k]} />
      ))}
    </div>
  );
}

/** Calibration: a photo of a patch, the patch marked on it, the spot meter's reading → k for this camera. */
export function CalibrationForm() {
  const router = useRouter();
  const [rect, setRect] = useState<MarkedRect | null>(null);
  const [busy, setBusy] = useState(false);
  const [out, setOut] = useState<{ ok: boolean; message: string; fieldErrors?: Record<string, string[]> } | null>(null);
  const [preview, pick] = usePreview();
  const submit = async (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    if (rect) for (const k of ['x', 'y', 'w', 'h'] as const) form.set(k, String(rect[k]));
    setBusy(true);
    try {
      const res = await fetch('/api/cameras/calibrate', { method: 'POST', body: form });
      const body = (await res.json().catch(() => ({}))) as ApiError & { profile?: { name: string; k: number } };
      if (res.ok && body.profile) {
        setOut({ ok: true, message: `Saved ${body.profile.name}: k = ${body.profile.k.toPrecision(4)} cd/m² per unit of Y·N²/(t·S).` });
        router.refresh();
      } else setOut({ ok: false, message: body.error?.message ?? `The calibration was refused (${res.status})`, fieldErrors: body.error?.fieldErrors });
    } catch {
      setOut({ ok: false, message: 'The connection dropped. Try again.' });
    } finally {
      setBusy(false);
    }
  };
  return (
    <form onSubmit={submit} className="space-y-3" data-testid="calibration-form">
      <ol className="list-decimal space-y-1 pl-5 text-sm text-muted">
        <li>Light a flat, matte patch evenly and read its luminance with a spot luminance meter from the camera position.</li>
        <li>Photograph it with the camera in manual mode, the patch well exposed and not clipped.</li>
        <li>Choose the photo, drag a rectangle inside the patch, and enter the meter reading.</li>
      </ol>
      <label className="block text-sm">
        <span className="mb-1 block text-muted">Photo of the patch</span>
        <input name="photo" type="file" accept="image/jpeg,image/png,image/tiff,image/webp" required data-testid="calibration-photo" onChange={(e) => pick(e.target.files?.[0] ?? null)} />
      </label>
      {preview ? <RectMarker src={preview} rect={rect} onRect={setRect} label="Calibration photo: drag over the patch" /> : null}
      <RectFields rect={rect} onRect={setRect} errors={out?.fieldErrors} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Meter reading (cd/m²)" name="meterCdm2" type="number" step="any" min="0" required errors={out?.fieldErrors?.meterCdm2} />
        <Field label="Profile name" name="name" placeholder="e.g. Bench camera A" errors={out?.fieldErrors?.name} />
        <Field label="Make (only if the EXIF has none)" name="make" errors={out?.fieldErrors?.make} />
        <Field label="Model (only if the EXIF has none)" name="model" errors={out?.fieldErrors?.model} />
      </div>
      <Button type="submit" disabled={busy}>{busy ? 'Calibrating…' : 'Calibrate'}</Button>
      {out ? (
        <p role={out.ok ? 'status' : 'alert'} className={out.ok ? 'text-sm text-pass' : 'text-sm text-fail'} data-testid="calibration-result">
          {out.message}
        </p>
      ) : null}
    </form>
  );
}

type LinearityOut = { linearity: { exponent: number; maxDeviation: number; linear: boolean; warning: string | null; levels: (number | null)[]; expected: number[] }; clipped: boolean[]; savedTo: { name: string } | null; camera: { make: string; model: string } | null };

/** Linearity check: a photo of the grey-steps pattern → measured steps against expected, the fitted exponent and a verdict. */
export function LinearityForm() {
  const router = useRouter();
  const [rect, setRect] = useState<MarkedRect | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [out, setOut] = useState<LinearityOut | null>(null);
  const [preview, pick] = usePreview();
  const submit = async (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    for (const k of ['x', 'y', 'w', 'h'] as const) form.set(k, rect ? String(rect[k]) : '');
    setBusy(true);
    setError(null);
    try {
      const res = await fetch('/api/cameras/linearity', { method: 'POST', body: form });
      const body = (await res.json().catch(() => ({}))) as ApiError & LinearityOut;
      if (res.ok && body.linearity) {
        setOut(body);
        if (body.savedTo) router.refresh();
      } else {
        setOut(null);
        setError(body.error?.message ?? `The check was refused (${res.status})`);
      }
    } catch {
      setError('The connection dropped. Try again.');
    } finally {
      setBusy(false);
    }
  };
  const l = out?.linearity;
  return (
    <form onSubmit={submit} className="space-y-3" data-testid="linearity-form">
      <p className="text-sm text-muted">
        Show the grey-steps pattern fullscreen (Test patterns → grey steps), photograph it square-on with the settings you measure with, the white step just under clipping. Drag over the pattern if it does not fill the photo.
      </p>
      <label className="block text-sm">
        <span className="mb-1 block text-muted">Photo of the grey-steps pattern</span>
        <input name="photo" type="file" accept="image/jpeg,image/png,image/tiff,image/webp" required data-testid="linearity-photo" onChange={(e) => pick(e.target.files?.[0] ?? null)} />
      </label>
      {preview ? <RectMarker src={preview} rect={rect} onRect={setRect} label="Grey-steps photo: drag over the pattern" /> : null}
      <Button type="submit" disabled={busy}>{busy ? 'Checking…' : 'Check linearity'}</Button>
      {error ? (
        <p role="alert" className="text-sm text-fail">
          {error}
        </p>
      ) : null}
      {l ? (
        <div className="space-y-2" data-testid="linearity-result">
          <p className={l.linear ? 'text-sm text-pass' : 'text-sm text-fail'}>
            {l.linear ? 'Linear: fit for photometry.' : 'Not linear.'} Fitted exponent {l.exponent.toFixed(3)} (1 is linear); worst step {(100 * l.maxDeviation).toFixed(1)}% off the line.
            {out.savedTo ? ` Saved on ${out.savedTo.name}.` : out.camera ? ' No profile for this camera yet: calibrate it to keep the check.' : ''}
          </p>
          {l.warning ? <Notice tone="fail">{l.warning.charAt(0).toUpperCase() + l.warning.slice(1)}.</Notice> : null}
          <DataTable
            columns={[
              { key: 'step', label: 'Step', numeric: true },
              { key: 'expected', label: 'Expected', numeric: true },
              { key: 'measured', label: 'Measured', numeric: true },
            ]}
            rows={l.expected.map((e, i) => ({
              id: String(i),
              cells: {
                step: { text: String(i), sort: i },
                expected: { text: e.toFixed(3), sort: e },
                measured: { text: out.clipped[i] ? 'clipped' : l.levels[i] === null ? '—' : (l.levels[i] as number).toFixed(3), sort: out.clipped[i] ? null : l.levels[i] ?? null },
              },
            }))}
            csvName="linearity-check"
            testId="linearity-steps"
          />
        </div>
      ) : null}
    </form>
  );
}

/** A profile's degrees per pixel: typed in, saved on its own, blank to clear. */
export function DegreesPerPixelForm({ id, value }: { id: string; value: number | null }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [out, setOut] = useState<{ ok: boolean; message: string; fieldErrors?: Record<string, string[]> } | null>(null);
  const submit = async (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const raw = String(new FormData(e.currentTarget).get('degreesPerPixel') ?? '');
    setBusy(true);
    try {
      const res = await fetch(`/api/cameras/${id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ degreesPerPixel: raw }) });
      const body = (await res.json().catch(() => ({}))) as ApiError & { profile?: { degreesPerPixel: number | null } };
      if (res.ok && body.profile) {
        setOut({ ok: true, message: body.profile.degreesPerPixel === null ? 'Cleared: the field of view comes from the EXIF focal length.' : 'Saved: new readings take their field of view from it.' });
        router.refresh();
      } else setOut({ ok: false, message: body.error?.message ?? `Not saved (${res.status})`, fieldErrors: body.error?.fieldErrors });
    } catch {
      setOut({ ok: false, message: 'The connection dropped. Try again.' });
    } finally {
      setBusy(false);
    }
  };
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-2" data-testid="degrees-per-pixel-form">
      <Field
        label="Degrees per pixel"
        name="degreesPerPixel"
        inputMode="decimal"
        defaultValue={value === null ? '' : String(value)}
        placeholder="from EXIF"
        hint="Measured on a target of known angle."
        errors={out?.fieldErrors?.degreesPerPixel}
      />
      <Button type="submit" disabled={busy}>{busy ? 'Saving…' : 'Save'}</Button>
      {out ? (
        <p role={out.ok ? 'status' : 'alert'} className={out.ok ? 'text-xs text-pass' : 'text-xs text-fail'}>
          {out.message}
        </p>
      ) : null}
    </form>
  );
}

export function DeleteProfileButton({ id, name }: { id: string; name: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      tone="danger"
      disabled={busy}
      onClick={async () => {
        if (!window.confirm(`Delete the profile ${name}? Readings already taken keep their values.`)) return;
        setBusy(true);
        await fetch(`/api/cameras/${id}`, { method: 'DELETE' }).catch(() => undefined);
        setBusy(false);
        router.refresh();
      }}
    >
      Delete
    </Button>
  );
}
