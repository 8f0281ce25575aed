import type { Metadata } from 'next';
import Link from 'next/link';
import { CaptureCautions } from '@/components/patterns/capture-cautions';
import { parsePatternSize, PATTERN_INFO, patternUrl, showUrl } from '@/components/patterns/params';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Notice, PageTitle, Panel } from '@/components/ui/panel';
import { requireActor } from '@/lib/server/auth/session';
import { isPatternKind, PATTERN_KINDS, PATTERN_MAX_SIZE, PATTERN_MIN_SIZE, PATTERN_PRESETS, type PatternKind } from '@/lib/patterns';

export const metadata: Metadata = { title: 'Test patterns' };

const DEFAULT_PRESET = '1280x720';

const MEASUREMENTS: { what: string; kind: PatternKind; note: string }[] = [
  { what: 'Ambient contrast ratio', kind: 'white', note: 'Capture set pattern “full”' },
  { what: 'Uniformity', kind: 'white', note: 'Nine cells of the screen compared' },
  { what: 'Ghost ratio', kind: 'white', note: 'The lit screen’s displaced copy is measured' },
  { what: 'ANSI contrast', kind: 'checkerboard', note: 'Capture set pattern “checkerboard”' },
  { what: 'Sharpness (MTF50)', kind: 'slanted-edge', note: 'Capture set pattern “slanted-edge”' },
  { what: 'Camera linearity check', kind: 'grey-steps', note: 'Confirms the camera’s response before trusting ratios' },
  { what: 'Image handedness', kind: 'orientation', note: 'Capture set pattern “orientation”: normal, mirrored or turned, set beside the planner’s prediction' },
];

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

// Keeps the preview light: the real file is drawn at full size only for download and the device.
function previewSize(width: number, height: number): { width: number; height: number } {
  const s = Math.min(1, 960 / width, 540 / height);
  return {
    width: Math.max(PATTERN_MIN_SIZE, Math.round(width * s)),
    height: Math.max(PATTERN_MIN_SIZE, Math.round(height * s)),
  };
}

export default async function PatternsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requireActor();
  const sp = await searchParams;
  const kindParam = one(sp.kind);
  const kind: PatternKind = kindParam && isPatternKind(kindParam) ? kindParam : 'checkerboard';
  const presetParam = one(sp.preset) ?? DEFAULT_PRESET;
  const custom = presetParam === 'custom';
  const preset = custom ? null : (PATTERN_PRESETS.find((p) => p.id === presetParam) ?? PATTERN_PRESETS.find((p) => p.id === DEFAULT_PRESET) ?? PATTERN_PRESETS[0]);
  const size = custom ? parsePatternSize(one(sp.width), one(sp.height)) : { ok: true as const, width: preset?.width ?? 1280, height: preset?.height ?? 720 };
  const fieldErrors = size.ok ? undefined : size.errors;
  const width = size.ok ? size.width : null;
  const height = size.ok ? size.height : null;
  const query = (k: PatternKind) => {
    const q = new URLSearchParams({ kind: k, preset: custom ? 'custom' : (preset?.id ?? DEFAULT_PRESET) });
    if (custom) {
      q.set('width', one(sp.width) ?? '');
      q.set('height', one(sp.height) ?? '');
    }
    return `/patterns?${q.toString()}`;
  };

  return (
    <>
      <PageTitle kicker="Capture" title="Test patterns" />
      <p className="-mt-4 mb-6 max-w-3xl text-sm text-muted">
        Show the pattern fullscreen on the device’s own display at its native resolution, so one pattern pixel is one panel pixel. The patterns are plain sRGB images; set the
        display to a fixed brightness before a capture set and keep it there.
      </p>

      <div className="grid gap-6 xl:grid-cols-[minmax(0,1.4fr)_minmax(0,1fr)]">
        <div className="space-y-6">
          <Panel title="Generator">
            <form method="get" action="/patterns" className="grid gap-4 sm:grid-cols-2" noValidate>
              <label className="block text-sm">
                <span className="mb-1 block text-muted">Pattern</span>
                <select name="kind" aria-label="Pattern" defaultValue={kind} className="w-full rounded-md border border-line bg-canvas px-3 py-2 text-ink">
                  {PATTERN_KINDS.map((k) => (
                    <option key={k} value={k}>
                      {PATTERN_INFO[k].name}
                    </option>
                  ))}
                </select>
              </label>
              <label className="block text-sm">
                <span className="mb-1 block text-muted">Size</span>
                <select name="preset" aria-label="Size" defaultValue={custom ? 'custom' : preset?.id} className="w-full rounded-md border border-line bg-canvas px-3 py-2 text-ink">
                  {PATTERN_PRESETS.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.label}
                    </option>
                  ))}
                  <option value="custom">Custom width × height</option>
                </select>
              </label>
              <Field
                label="Custom width (px)"
                name="width"
                inputMode="numeric"
                defaultValue={one(sp.width) ?? ''}
                placeholder={String(preset?.width ?? 1280)}
                hint={`Used when Size is Custom; ${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE}`}
                errors={fieldErrors?.width}
              />
              <Field
                label="Custom height (px)"
                name="height"
                inputMode="numeric"
                defaultValue={one(sp.height) ?? ''}
                placeholder={String(preset?.height ?? 720)}
                hint={`Used when Size is Custom; ${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE}`}
                errors={fieldErrors?.height}
              />
              <div className="sm:col-span-2">
                <Button type="submit">Update preview</Button>
              </div>
            </form>
          </Panel>

          <Panel
            title={
              <span data-testid="pattern-title">
                {PATTERN_INFO[kind].name}
                {width && height ? ` · ${width} × ${height}` : ''}
              </span>
            }
            actions={
              width && height ? (
                <>
                  <a
                    href={patternUrl(kind, width, height)}
                    download={`${kind}-${width}x${height}.png`}
                    className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60"
                  >
                    Download PNG
                  </a>
                  <Link href={showUrl(kind, width, height)} className="rounded-md bg-beam px-3 py-1.5 text-sm font-semibold text-canvas hover:bg-beam/85">
                    Show fullscreen
                  </Link>
                </>
              ) : null
            }
          >
            <p className="mb-3 text-sm text-muted">{PATTERN_INFO[kind].use}</p>
            {width && height ? (
              <div className="flex justify-center rounded-md border border-line bg-black p-3">
                {/* eslint-disable-next-line @next/next/no-img-element -- a generated PNG at an exact size; the image optimiser would resample it */}
                <img
                  data-testid="pattern-preview"
                  src={patternUrl(kind, previewSize(width, height).width, previewSize(width, height).height)}
                  alt={`${PATTERN_INFO[kind].name} preview`}
                  width={previewSize(width, height).width}
                  height={previewSize(width, height).height}
                  className="h-auto max-w-full [image-rendering:pixelated]"
                />
              </div>
            ) : (
              <Notice tone="fail">Fix the size above to see the pattern.</Notice>
            )}
            <p className="mt-3 text-xs text-muted">
              Fullscreen keys: ← / → or space to step through the patterns, F for the browser’s fullscreen, Esc or Q to come back here. The cursor is hidden.
            </p>
          </Panel>

          <Panel title="All patterns">
            <ul className="grid grid-cols-2 gap-3 sm:grid-cols-4">
              {PATTERN_KINDS.map((k) => (
                <li key={k}>
                  <Link
                    href={query(k)}
                    aria-current={k === kind ? 'true' : undefined}
                    className={`block rounded-md border p-2 text-xs ${k === kind ? 'border-beam text-beam' : 'border-line text-muted hover:border-beam/60 hover:text-ink'}`}
                  >
                    {/* eslint-disable-next-line @next/next/no-img-element -- tiny generated thumbnail */}
                    <img src={patternUrl(k, 160, 96)} alt="" width={160} height={96} className="mb-1 h-auto w-full border border-line" />
                    {PATTERN_INFO[k].name}
                  </Link>
                </li>
              ))}
            </ul>
          </Panel>
        </div>

        <div className="space-y-6">
          <Panel title="Which pattern for which measurement">
            <table className="w-full text-sm" data-testid="pattern-guide">
              <thead className="text-left text-xs uppercase tracking-wider text-muted">
                <tr>
                  <th className="pb-2 font-medium">Measurement</th>
                  <th className="pb-2 font-medium">Show</th>
                </tr>
              </thead>
              <tbody>
                {MEASUREMENTS.map((m) => (
                  <tr key={m.what} className="border-t border-line align-top">
                    <td className="py-2 pr-3">
                      <div className="text-ink">{m.what}</div>
                      <div className="text-xs text-muted">{m.note}</div>
                    </td>
                    <td className="py-2">
                      <Link href={query(m.kind)} className="text-beam hover:underline">
                        {PATTERN_INFO[m.kind].name}
                      </Link>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Panel>
          <CaptureCautions />
        </div>
      </div>
    </>
  );
}
