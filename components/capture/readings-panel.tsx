import Link from 'next/link';
import { DataTable } from '@/components/ui/data-table';
import { Notice } from '@/components/ui/panel';
import type { AnalysisWithReading } from '@/db/queries/analyses';
import type { Reading } from '@/db/queries/readings';
import type { CaptureResult, WarningCode } from '@/lib/photometry/result';
import { formatMetricValue, formatMetricWithU, METRIC_FORMATS } from '@/lib/format/metrics';
import { DASH, fixed, isNum } from '@/lib/format/numbers';
import { formatLuminance, formatSig } from '@/lib/format/quantities';
import type { MetricKey } from '@/lib/targets/metrics';
import { MetricRowsTable } from './metric-rows-table';

/** One row of the panel: a name, the figure (± its standard uncertainty when known), its unit and what it is. */
export type Metric = { key: string; label: string; value: string; unit: string; definition: string };

const f = (v: number | null | undefined, digits = 3): string => (isNum(v) ? fixed(v, digits) : DASH);
const pct = (v: number | null | undefined, digits = 2): string => (isNum(v) ? fixed(v * 100, digits) : DASH);
const formatPercentPlain = (v: number | null | undefined): string => pct(v, 3);

// shifts and offsets to 0.1 px, as the engine resolves them
const formatOffset = (v: number): string => (Number.isInteger(v) ? String(v) : fixed(v, 1));

// What to do about each warning; a code this panel does not know yet shows the engine's message alone.
const ADVICE: Partial<Record<WarningCode | string, string>> = {
  clipped: 'Lower the exposure (or bracket) and shoot again: clipped pixels make the contrast look lower than it is.',
  shifted: 'The camera moved a little between photos; the photos were aligned, but a firmer tripod gives cleaner numbers.',
  'exposure-unknown': 'Use a camera that writes exposure time, f-number and ISO, and keep them fixed; otherwise exposures are assumed equal.',
  'transmission-over-screen': 'Mark a background region away from the screen for a cleaner transmission and tint.',
  'checkerboard-unclear': 'Check that the 4 × 4 checkerboard fills the marked screen exactly and that the pattern setting matches.',
  'low-signal': 'The display light is weak against the noise: raise the display level or the exposure.',
  'ghost-band-clipped': 'The ghost band reaches the photo edge: centre the view or mark the ghost by hand.',
  'calibration-needs-exposure': 'Absolute luminance needs EXIF exposure data in every photo.',
  rotated: 'The camera turned between photos: lock the tripod head, switch the display without touching the camera (a remote release helps) and shoot the set again.',
  'registration-uncertain': 'The photos could not be matched with confidence: keep the camera still, let the room show some texture beside the display, and shoot again.',
  'screen-fills-frame': 'The screen covers most of the photo: step back or zoom out so the room shows around it, or mark the screen by hand.',
  'multi-page': 'Only the first page of the TIFF was measured: export the view you mean as a single-page TIFF if that was not it.',
  'ratio-near-one': 'On and off look the same within the noise: check that the display was lit in the on photo and dark in the off photo.',
  'uniformity-invalid': 'The display light is not above the background across the screen: check the screen region and that the display was lit.',
  'transmission-above-one': 'More light arrived through the optics than without them: stray light (a veil) from the optics adds to the view. Mark a background region away from the screen and its glow, and shade the optics from lamps.',
  'both-clipped': 'The on and off photos are both clipped: lower the exposure, or bracket, and shoot again.',
  'ghost-weak': 'The ghost is barely above the noise: raise the display level or the exposure, or mark the ghost by hand if you know where it is.',
  'see-through-range-small': 'The optics\u2019 own transmission and the veil need dark and bright things behind the optics: mark a background region that takes in both (a dark and a white card side by side will do).',
  'see-through-unfitted': 'Too little of the room could be paired between the off and ambient photos: mark a larger background region where neither photo is clipped.',
};

/** The figure of a catalogued metric read from the result (readings of every engine version). */
const VALUE: Partial<Record<MetricKey, (r: CaptureResult) => number | null | undefined>> = {
  ambientContrastRatio: (r) => r.ambientContrastRatio,
  michelson: (r) => r.michelson,
  ansiContrast: (r) => r.ansiContrast,
  uniformity: (r) => r.uniformity,
  ghostRatio: (r) => r.ghost?.ratio,
  transmission: (r) => r.transmission,
  tintDeltaE00: (r) => r.tint?.deltaE00,
  transmissionOptics: (r) => r.transmissionOptics,
  veil: (r) => r.veil?.relative,
};

/**
 * A row for a catalogued metric: its label, the figure ± its standard uncertainty (digits from the
 * uncertainty), the unit and any `detail` after it, and the catalogue's one-line definition.
 */
export function metricRow(key: MetricKey, r: CaptureResult, o: { rowKey?: string; value?: string; detail?: string; definition?: string } = {}): Metric {
  const f = METRIC_FORMATS[key];
  const u = (r.uncertainty as Partial<Record<string, number>> | undefined)?.[key];
  const v = VALUE[key]?.(r);
  const unit = f.unit === ': 1' ? 'ratio' : f.unit;
  return {
    key: o.rowKey ?? key,
    label: f.label,
    value: o.value ?? formatMetricWithU(key, v, u, { unit: false }),
    unit: [unit, o.detail].filter(Boolean).join(' · '),
    definition: o.definition ?? f.definition,
  };
}


/** Every row of the panel for a reading; other panels add their own rows beside it. */
export function metrics(r: Reading): Metric[] {
  const res = r.result;
  const abs = res.absoluteLuminance;
  const rel = (v: number | null | undefined): string => formatSig(v, 4);
  const out: Metric[] = [
    metricRow('ambientContrastRatio', res, { rowKey: 'acr' }),
    metricRow('michelson', res, { definition: res.pattern === 'checkerboard' ? '(Lw − Lb)/(Lw + Lb) of the checkerboard\u2019s white and black cells, 0 to 1.' : METRIC_FORMATS.michelson.definition }),
    metricRow('ansiContrast', res, { rowKey: 'ansi' }),
    metricRow('uniformity', res, { detail: 'min/max' }),
    metricRow('ghostRatio', res, { rowKey: 'ghost', value: res.ghost ? undefined : 'none found', detail: res.ghost ? `at (${formatOffset(res.ghost.dx)}, ${formatOffset(res.ghost.dy)}) px` : '' }),
    metricRow('transmission', res),
  ];
  // the optics' own transmission and the veil (engine 1.2.0 on; absent from older readings)
  if (res.transmissionOptics !== undefined) {
    const ch = res.veil?.channels;
    const t = (v: number): string => formatMetricValue('transmissionOptics', v, { unit: false });
    out.push(metricRow('transmissionOptics', res, { detail: ch ? `R ${t(ch.r.t)} · G ${t(ch.g.t)} · B ${t(ch.b.t)} %` : '' }));
  }
  if (res.veil !== undefined) {
    const v = res.veil;
    const parts = v ? [v.cdm2 === null ? '' : `${formatLuminance(v.cdm2)} cd/m²`, `room range ${formatSig(v.rangeRatio, 2)} : 1`, v.source === 'background' ? 'over the background region' : 'over the room around the display'] : [];
    out.push(metricRow('veil', res, { detail: parts.filter(Boolean).join(' · ') }));
  }
  out.push(
    metricRow('tintDeltaE00', res, { rowKey: 'tint', detail: res.tint ? `Δxy (${formatSig(res.tint.dx, 3)}, ${formatSig(res.tint.dy, 3)})` : '' }),
    { key: 'lon', label: 'Luminance, display on', value: rel(res.luminance.on), unit: 'relative', definition: 'Mean linear Y over the screen, on the on photo\u2019s exposure (sRGB white = 1).' },
    { key: 'loff', label: 'Luminance, display off', value: rel(res.luminance.off), unit: 'relative', definition: 'The see-through background behind the screen.' },
    { key: 'lamb', label: 'Luminance, without optics', value: rel(res.luminance.ambient), unit: 'relative', definition: 'The same area with the optics out of the path.' },
    { key: 'clip', label: 'Clipped pixels', value: formatPercentPlain(res.clippedFraction), unit: '%', definition: 'Share of pixels with a channel at ≥ 98 % of full scale inside the analysed regions.' },
    { key: 'reg', label: 'Registration, off photo', value: `${formatOffset(res.registration.off.dx)}, ${formatOffset(res.registration.off.dy)}`, unit: 'px', definition: 'Shift of the off photo against the on photo, found by phase correlation.' },
  );
  // fields of newer engines, shown only where the reading has them
  if (res.ghost && res.ghost.snr !== null && res.ghost.snr !== undefined) {
    out.push({ key: 'ghost-snr', label: 'Ghost SNR', value: f(res.ghost.snr, 1), unit: 'standard errors', definition: 'How far the light at the ghost offset stands above the noise, against the same band mirrored to the other side (light spread by blur falls on both sides alike).' });
  }
  const edge = res.edge ?? (res.ghost?.edgeZone !== undefined ? { zone: res.ghost.edgeZone, spread: null } : null);
  if (edge) {
    out.push({ key: 'edge-zone', label: 'Screen edge zone', value: f(edge.zone, 1), unit: edge.spread === null ? 'px' : `px · edge spread ${f(edge.spread, 1)} px`, definition: 'Band around the screen’s edge left out of the ghost search and measurement, from the edge’s 10–90 % rise in the photo.' });
  }
  for (const role of ['off', 'ambient', 'dark'] as const) {
    const a = res.alignment?.[role];
    if (!a) continue;
    out.push({
      key: `align-${role}`,
      label: `Alignment, ${role} photo`,
      value: `${fixed(a.dx, 1)}, ${fixed(a.dy, 1)}`,
      unit: `px · rotation ${fixed(a.rotationDeg, 2)}°`,
      definition: `Shift (to 0.1 px) and turn of the ${role} photo against the on photo, the display left out of the match; peak ${f(a.peakRatio, 2)}× the runner-up over ${a.windows} window${a.windows === 1 ? '' : 's'}${a.residual === null ? '' : `, residual ${pct(a.residual, 1)} %`}.`,
    });
  }
  // the worker adds the profile it converted with; readings from before camera profiles lack it
  const extra = res as typeof res & { cameraProfile?: { name: string }; brackets?: Partial<Record<string, { count: number; dynamicRange: number | null; stops: number | null }>> };
  if (abs) {
    const calibrated = abs.kind === 'calibrated';
    const source = calibrated ? `calibrated with ${extra.cameraProfile?.name ?? 'a camera profile'}` : 'uncalibrated — rough estimate';
    out.push({ key: 'abs', label: calibrated ? 'Display luminance' : 'Display luminance (rough estimate)', value: formatLuminance(abs.on, { estimate: !calibrated }), unit: source, definition: calibrated ? 'On photo converted with the camera profile’s factor k.' : 'From the reflected-light meter equation (K ≈ 12.5): for orientation only. Calibrate the camera under Lab settings → Camera profiles.' });
    out.push({ key: 'abs-off', label: calibrated ? 'Background luminance' : 'Background luminance (rough estimate)', value: formatLuminance(abs.off, { estimate: !calibrated }), unit: source, definition: 'The see-through background behind the screen, display dark.' });
  } else {
    out.push({ key: 'abs', label: 'Display luminance', value: '—', unit: 'uncalibrated', definition: 'No camera profile and no exposure EXIF: results are relative only.' });
  }
  // how the worker read the photos (readings from before linear photos on the web lack it: all sRGB)
  const decodedAs = (res as typeof res & { decodedAs?: Partial<Record<string, 'linear' | 'srgb' | 'mixed'>> }).decodedAs;
  if (decodedAs && Object.values(decodedAs).some((v) => v !== 'srgb')) {
    const text = Object.entries(decodedAs)
      .map(([role, v]) => `${role} ${v === 'srgb' ? 'sRGB' : v}`)
      .join(' · ');
    out.push({ key: 'decoded-as', label: 'Photos read as', value: text, unit: '', definition: 'Linear: 16-bit TIFF values taken as proportional to light; sRGB: decoded through the sRGB curve (capture set and photo settings).' });
  }
  // camera raw photos: the one white balance every raw photo of the set was decoded with
  const rawWb = (res as typeof res & { rawWhiteBalance?: { multipliers: number[]; source: 'daylight' | 'unity' } }).rawWhiteBalance;
  if (rawWb) {
    const [r = 1, g = 1, b = 1] = rawWb.multipliers;
    out.push({
      key: 'raw-white-balance',
      label: 'Raw white balance',
      value: `R ${f(r / g, 3)} · G 1 · B ${f(b / g, 3)}`,
      unit: rawWb.source === 'daylight' ? 'camera daylight (D65)' : 'unity: no colour data for this camera',
      definition: 'Channel multipliers applied to every raw photo of the set alike, from the first raw photo’s camera colour data; never the as-shot or an automatic balance.',
    });
  }
  for (const [role, b] of Object.entries(extra.brackets ?? {})) {
    if (b) out.push({ key: `bracket-${role}`, label: `Bracket, ${role} photo`, value: b.dynamicRange === null ? '—' : `${f(b.dynamicRange, 0)}:1`, unit: `${b.count} exposures${b.stops === null ? '' : ` · ${f(b.stops, 1)} stops`}`, definition: 'Photos of one role at different exposures merged into one linear plane; the range spans the brightest to the darkest measured pixels.' });
  }
  return out;
}

export function ReadingsPanel({ reading, analyses, captureSetId, selectedId }: { reading: Reading | null; analyses: AnalysisWithReading[]; captureSetId: string; selectedId: string | null }) {
  const histograms = reading?.artifacts.data?.histograms ?? {};
  return (
    <div className="space-y-5">
      {reading ? (
        <>
          <div className="flex flex-wrap items-baseline gap-x-6 gap-y-1">
            <div>
              <div className="text-xs uppercase tracking-[0.16em] text-muted">Ambient contrast ratio</div>
              <div className="font-mono text-3xl text-beam">
                <span data-testid="acr-value">{f(reading.ambientContrastRatio)}</span>
                {isNum(reading.uncertainty.ambientContrastRatio) ? <span className="ml-2 text-base text-muted" data-testid="acr-uncertainty">± {formatSig(reading.uncertainty.ambientContrastRatio, 2)}</span> : null}
              </div>
            </div>
            <div className="text-xs text-muted">
              Engine {reading.engineVersion} · {reading.result.image.width} × {reading.result.image.height} px · screen {reading.result.screen.source} at {reading.result.screen.x}, {reading.result.screen.y}, {reading.result.screen.w} × {reading.result.screen.h} · {reading.createdAt.toISOString().slice(0, 16).replace('T', ' ')} UTC
            </div>
          </div>
          {reading.result.warnings.length ? (
            <div className="space-y-2" data-testid="warnings">
              {reading.result.warnings.map((w) => (
                <Notice key={w.code}>
                  <strong className="mr-1">{w.code}:</strong>
                  {w.message}
                  {ADVICE[w.code] ? <span className="block text-xs text-muted">{ADVICE[w.code]}</span> : null}
                </Notice>
              ))}
            </div>
          ) : (
            <p className="text-sm text-pass">No warnings.</p>
          )}
          <MetricRowsTable rows={metrics(reading)} testId="metrics" />
          {reading.artifacts.logContrastKey ? (
            <div className="grid gap-4 md:grid-cols-2">
              <figure>
                {/* eslint-disable-next-line @next/next/no-img-element -- session-bound artifact */}
                <img src={`/api/analyses/${reading.analysisId}/artifacts/log-contrast.png`} alt="Map of local contrast, log10(on/off)" className="w-full rounded border border-line" />
                <figcaption className="mt-1 text-xs text-muted">Local contrast log10(on/off), 0 to {f(reading.artifacts.data?.logContrast.max, 2)}</figcaption>
              </figure>
              <figure>
                {/* eslint-disable-next-line @next/next/no-img-element -- session-bound artifact */}
                <img src={`/api/analyses/${reading.analysisId}/artifacts/difference.png`} alt="Map of display light, on minus off" className="w-full rounded border border-line" />
                <figcaption className="mt-1 text-xs text-muted">Display light D = on − off, 0 to {f(reading.artifacts.data?.difference.max, 4)}</figcaption>
              </figure>
            </div>
          ) : null}
          {Object.keys(histograms).length ? (
            <div>
              <h3 className="mb-2 text-xs font-semibold uppercase tracking-[0.16em] text-muted">Luminance histograms (stops)</h3>
              <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                {Object.entries(histograms).map(([role, h]) => {
                  const max = Math.max(1, ...h.counts);
                  return (
                    <figure key={role} className="rounded border border-line p-2">
                      <svg viewBox={`0 0 ${h.counts.length} 40`} preserveAspectRatio="none" className="h-16 w-full" role="img" aria-label={`Histogram of the ${role} photo`}>
                        {h.counts.map((c, i) => (
                          <rect key={i} x={i} y={40 - (40 * c) / max} width={0.9} height={(40 * c) / max} fill="rgb(var(--beam))" />
                        ))}
                      </svg>
                      <figcaption className="mt-1 flex justify-between text-[10px] text-muted">
                        <span>{role}</span>
                        <span>
                          2^{h.log2Min} … 2^{h.log2Max}
                        </span>
                      </figcaption>
                    </figure>
                  );
                })}
              </div>
            </div>
          ) : null}
        </>
      ) : (
        <p className="text-sm text-muted">No reading yet. Upload the on and off photos (ambient for transmission and tint), mark or detect the screen, then analyse.</p>
      )}
      {analyses.length ? (
        <div>
          <h3 className="mb-2 text-xs font-semibold uppercase tracking-[0.16em] text-muted">History</h3>
          <DataTable
            csvName="analyses"
            columns={[
              { key: 'when', label: 'Queued' },
              { key: 'status', label: 'Status' },
              { key: 'acr', label: 'Contrast ratio', numeric: true },
              { key: 'warnings', label: 'Warnings', numeric: true },
              { key: 'engine', label: 'Engine' },
              { key: 'note', label: 'Message' },
            ]}
            rows={analyses.map((a) => ({
              id: a.id,
              href: a.readingId ? `/captures/${captureSetId}?analysis=${a.id}` : undefined,
              cells: {
                when: { text: `${a.queuedAt.toISOString().slice(0, 19).replace('T', ' ')}${a.id === selectedId ? ' (shown)' : ''}`, sort: a.queuedAt.getTime() },
                status: { text: a.status },
                acr: { text: f(a.ambientContrastRatio), sort: a.ambientContrastRatio },
                warnings: { text: a.warningCount === null ? '—' : String(a.warningCount), sort: a.warningCount },
                engine: { text: a.engineVersion ?? '—' },
                note: { text: a.error ?? '' },
              },
            }))}
          />
          {selectedId && analyses[0]?.id !== selectedId ? (
            <Link href={`/captures/${captureSetId}`} className="mt-2 inline-block text-xs text-beam hover:underline">
              Show the newest reading
            </Link>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
