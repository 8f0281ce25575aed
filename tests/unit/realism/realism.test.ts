/**
 * Realism suite: capture sets rendered the way a camera behind real optics makes them (see
 * tests/fixtures/realistic-scene.ts), each camera condition on its own and all together, analysed by
 * the engine through its file entry (the one the CLI and the worker call) and checked against the
 * truth of the noise-free linear scene (docs/method.md §5).
 *
 * Truth, per metric:
 * - contrast ratio, Michelson, ANSI contrast, transmission: means over the true screen / background of
 *   the noise-free scene, with no camera effect at all. Vignetting multiplies on, off and ambient
 *   alike, so these ratios carry none of it in truth.
 * - uniformity: min/max of the 3 × 3 cells of on − off (or of the dark photo) of the noise-free scene
 *   times the camera's vignetting: uniformity compares places, and no photo of the set can tell the
 *   lens's fall-off from the display's, so the truth is the display as this camera sees it.
 * - ghost: the gain and offset the scene's ghost was drawn with (ghost light over primary light).
 * - registration: the camera pose each photo was taken from.
 * - tint: Δxy and ΔE00 of the noise-free off and ambient colour over the background.
 *
 * Tolerances (relative unless said): ratios ±1.5%, uniformity ±2%, linear TIFF ratios ±0.5%, ghost
 * ratio ±8% (±6% from a dark photo), ghost offset within 1.5 px, no ghost: ≤ 0.5% or none reported,
 * registration within 1 px. Tint has no stated tolerance; ±0.002 in x and y and ±0.5 ΔE00 (half a
 * just-noticeable difference) are this suite's own choice.
 *
 * Every scene is first proved passable: a reference measurement written here (reference.ts, not the
 * engine) from the decoded photos with the known registration and regions must land within the same
 * tolerance. Each check records truth, reference and engine in a table printed after the run (and
 * written to veilmeter-realism-report.md in the system's temporary folder).
 *
 * Cost, measured 2026-12-05 on this 2-core machine: about 105 s of CPU for the 18 scenes (user + sys,
 * a third of it the 24 MP scene), peak RSS 1.7 GB (the 24 MP scene's planes).
 */
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { analyzeFiles, type AnalyzeFilesOptions, type FileAnalysis } from '../../../lib/image/analyze-files';
import { ISO800, poseMap, renderRealisticScene, type RealisticCapture, type RealisticSceneOptions, type Role } from '../../fixtures/realistic-scene';
import { checkerboardOf, decodeLinear, ghostOffsetFromEdges, ghostRatioAt, meanOver, sampler, shiftByCorrelation, tintOf, uniformityOf, type LinearPhoto, type Sampler } from './reference';

type Reading = FileAnalysis['result'];

interface Row {
  scene: string;
  metric: string;
  truth: string;
  reference: string;
  engine: string;
  tolerance: string;
  verdict: 'pass' | 'FAIL' | 'info';
  referenceOk: boolean;
}

const rows: Row[] = [];
const fmt = (v: number | null | undefined, digits = 4): string => (v === null || v === undefined || !Number.isFinite(v) ? String(v) : Math.abs(v) >= 100 ? v.toFixed(1) : v.toPrecision(digits));

type Tolerance = { kind: 'rel'; tol: number } | { kind: 'abs'; tol: number };

function within(v: number | null | undefined, truth: number, t: Tolerance): boolean {
  if (v === null || v === undefined || !Number.isFinite(v)) return false;
  return t.kind === 'rel' ? Math.abs(v - truth) <= t.tol * Math.abs(truth) : Math.abs(v - truth) <= t.tol;
}
const tolText = (t: Tolerance): string => (t.kind === 'rel' ? `±${(100 * t.tol).toFixed(1)}%` : `±${t.tol}`);

/** Records and checks one metric: the reference must be within tolerance (passable), then the engine. */
function checkValue(scene: string, metric: string, truth: number, reference: number | null, engine: number | null | undefined, t: Tolerance): void {
  const refOk = reference === null || within(reference, truth, t);
  const engOk = within(engine, truth, t);
  rows.push({ scene, metric, truth: fmt(truth), reference: reference === null ? '—' : fmt(reference), engine: fmt(engine), tolerance: tolText(t), verdict: engOk ? 'pass' : 'FAIL', referenceOk: refOk });
  expect.soft(refOk, `${scene}: reference ${metric} ${fmt(reference)} vs truth ${fmt(truth)} (${tolText(t)}): the scene is not passable`).toBe(true);
  expect.soft(engOk, `${scene}: engine ${metric} ${fmt(engine)} vs truth ${fmt(truth)} (${tolText(t)})`).toBe(true);
}

function checkOffset(scene: string, metric: string, truth: { dx: number; dy: number }, reference: { dx: number; dy: number } | null, engine: { dx: number; dy: number } | null | undefined, tol: number): void {
  const dist = (o: { dx: number; dy: number } | null | undefined): number => (o ? Math.hypot(o.dx - truth.dx, o.dy - truth.dy) : Number.POSITIVE_INFINITY);
  const refOk = reference === null || dist(reference) <= tol;
  const engOk = dist(engine) <= tol;
  const show = (o: { dx: number; dy: number } | null | undefined): string => (o ? `(${fmt(o.dx, 3)}, ${fmt(o.dy, 3)})` : String(o));
  rows.push({ scene, metric, truth: show(truth), reference: reference ? show(reference) : '—', engine: show(engine), tolerance: `≤ ${tol} px`, verdict: engOk ? 'pass' : 'FAIL', referenceOk: refOk });
  expect.soft(refOk, `${scene}: reference ${metric} ${show(reference)} vs truth ${show(truth)}: the scene is not passable`).toBe(true);
  expect.soft(engOk, `${scene}: engine ${metric} ${show(engine)} vs truth ${show(truth)} (within ${tol} px)`).toBe(true);
}

function info(scene: string, metric: string, truth: string, engine: string): void {
  rows.push({ scene, metric, truth, reference: '—', engine, tolerance: '—', verdict: 'info', referenceOk: true });
}

// ---------------------------------------------------------------------------------------------------

const GHOST = { gain: 0.05, dx: 80.4, dy: 50.6, blur: 1.5 };
const CREEP = { off: { dx: 0.4, dy: 1.3 }, ambient: { dx: -1.6, dy: 0.8 } };

interface SceneRun {
  name: string;
  capture: RealisticCapture;
  reading: Reading | null;
  error: Error | null;
  engineMs: number;
  photos: Partial<Record<Role, LinearPhoto>>;
  /** World-coordinate samplers of each role's luminance on the on photo's exposure. */
  y: Partial<Record<Role, Sampler>>;
}

interface RunOptions {
  /** The on role is analysed as this bracket (indexes into the rendered on photos); default the first photo. */
  onBracket?: number[];
  /** The on photo the reference measures (index), default 0. */
  referenceOn?: number;
  keepRgb?: boolean;
}

async function runScene(name: string, options: RealisticSceneOptions, run: RunOptions = {}): Promise<SceneRun> {
  const capture = await renderRealisticScene(options);
  const linear16 = capture.format === 'tiff16-linear';
  const ext = linear16 ? 'tif' : 'jpg';
  const file = (role: Role, k = 0): { name: string; bytes: Uint8Array } => ({ name: `${role}-${k}.${ext}`, bytes: (capture.photos[role] as Buffer[])[k] as Buffer });
  const request: AnalyzeFilesOptions = {
    on: run.onBracket ? run.onBracket.map((k) => file('on', k)) : file('on'),
    off: file('off'),
    ambient: capture.photos.ambient ? file('ambient') : null,
    dark: capture.photos.dark ? file('dark') : null,
    pattern: capture.truth.pattern,
    background: capture.truth.background,
    linear16,
    artifacts: false,
  };
  let reading: Reading | null = null;
  let error: Error | null = null;
  const t0 = performance.now();
  try {
    reading = (await analyzeFiles(request)).result;
  } catch (e) {
    error = e as Error;
  }
  const engineMs = performance.now() - t0;
  const photos: Partial<Record<Role, LinearPhoto>> = {};
  const y: Partial<Record<Role, Sampler>> = {};
  const { width: W, height: H } = capture.truth;
  for (const role of ['on', 'off', 'ambient', 'dark'] as const) {
    const list = capture.photos[role];
    if (!list) continue;
    const k = role === 'on' ? (run.referenceOn ?? 0) : 0;
    const p = await decodeLinear(list[k] as Buffer, linear16, run.keepRgb ?? true);
    photos[role] = p;
    y[role] = sampler(p, 'y', poseMap(capture.truth.pose[role], W, H), (capture.truth.exposureScale[role] as number[])[k] as number);
  }
  info(name, 'timing', `render ${(capture.renderMs / 1000).toFixed(1)} s`, `engine ${(engineMs / 1000).toFixed(1)} s`);
  if (error) info(name, 'engine error', '—', error.message);
  if (reading) {
    const s = reading.screen;
    const t = capture.truth.screen;
    info(name, 'screen (x,y,w,h)', `${t.x},${t.y},${t.w},${t.h}`, `${s.x},${s.y},${s.w},${s.h} ${s.source}`);
    if (reading.warnings.length > 0) info(name, 'warnings', '—', reading.warnings.map((w) => w.code).join(', '));
  }
  return { name, capture, reading, error, engineMs, photos, y };
}

const diffSampler = (a: Sampler, b: Sampler): Sampler => (x, y) => a(x, y) - b(x, y);

interface CheckOptions {
  ratioTol?: number;
  /** Skip the registration check of these roles (a rotated photo has no single shift). */
  skipRegistration?: Role[];
  /** The on photo is clipped on purpose (a bracket's long exposure). */
  clippedOn?: boolean;
}

/** The metrics every scene reports, against truth, with the reference proving each passable. */
function standardChecks(r: SceneRun, o: CheckOptions = {}): void {
  const { name, capture, reading } = r;
  const truth = capture.truth;
  const ratio: Tolerance = { kind: 'rel', tol: o.ratioTol ?? 0.015 };
  expect.soft(r.error, `${name}: the engine refused the capture: ${r.error?.message}`).toBeNull();
  const on = r.y.on as Sampler;
  const off = r.y.off as Sampler;
  const d = diffSampler(on, off);
  // the truth has no clipping: a scene meant to be unclipped must be
  if (!o.clippedOn) expect(truth.clippedShareOn[0], `${name}: the scene clips ${(100 * (truth.clippedShareOn[0] as number)).toFixed(2)}% of the screen`).toBeLessThan(0.001);

  // registration: reference by normalised cross-correlation over a room patch (or the screen's corner for dark)
  const bg = truth.background;
  const roomPatch = { x: bg.x + Math.round(bg.w / 4), y: bg.y + Math.round(bg.h / 4), w: Math.round(bg.w / 2), h: Math.round(bg.h / 2) };
  const { width: W, height: H } = truth;
  for (const role of ['off', 'ambient', 'dark'] as const) {
    const photo = r.photos[role];
    if (!photo || o.skipRegistration?.includes(role)) continue;
    const raw = (p: LinearPhoto): Sampler => sampler(p, 'y', (x, y) => [x, y], 1);
    const patch = role === 'dark' ? { x: truth.screen.x - 40, y: truth.screen.y - 40, w: 80, h: 80 } : roomPatch;
    const ref = shiftByCorrelation(raw(r.photos.on as LinearPhoto), raw(photo), patch, 4);
    const pose = truth.pose[role];
    checkOffset(name, `registration.${role}`, { dx: pose.dx, dy: pose.dy }, ref, reading?.registration[role] ?? null, 1);
  }

  // contrast
  const lOn = meanOver(on, truth.screen);
  const lOff = meanOver(off, truth.screen);
  checkValue(name, 'ambientContrastRatio', truth.ambientContrastRatio, lOn / lOff, reading?.ambientContrastRatio, ratio);
  if (truth.pattern === 'full') {
    checkValue(name, 'michelson', truth.michelson, (lOn - lOff) / (lOn + lOff), reading?.michelson, ratio);
    checkValue(name, 'uniformity (on − off)', truth.uniformity as number, uniformityOf(d, truth.screen), reading?.variants.onMinusOff.uniformity, { kind: 'rel', tol: 0.02 });
    if (r.y.dark) checkValue(name, 'uniformity (dark)', truth.uniformityDark as number, uniformityOf(r.y.dark, truth.screen), reading?.variants.dark?.uniformity, { kind: 'rel', tol: 0.02 });
  } else {
    const cb = checkerboardOf(on, truth.screen);
    checkValue(name, 'ansiContrast', truth.ansiContrast as number, cb.ansi, reading?.ansiContrast, ratio);
    checkValue(name, 'michelson (checkerboard)', truth.michelson, cb.michelson, reading?.michelson, ratio);
  }

  // see-through transmission and tint over the background
  if (r.y.ambient) {
    checkValue(name, 'transmission', truth.transmission, meanOver(off, bg) / meanOver(r.y.ambient, bg), reading?.transmission, ratio);
    const pOff = r.photos.off as LinearPhoto;
    const pAmb = r.photos.ambient as LinearPhoto;
    if (pOff.r && pAmb.r) {
      const rgb = (p: LinearPhoto, role: Role): [number, number, number] =>
        (['r', 'g', 'b'] as const).map((c) => meanOver(sampler(p, c, poseMap(truth.pose[role], W, H), (truth.exposureScale[role] as number[])[0] as number), bg)) as [number, number, number];
      const t = tintOf(rgb(pOff, 'off'), rgb(pAmb, 'ambient'));
      checkValue(name, 'tint Δx', truth.tint.dx, t.dx, reading?.tint?.dx, { kind: 'abs', tol: 0.002 });
      checkValue(name, 'tint Δy', truth.tint.dy, t.dy, reading?.tint?.dy, { kind: 'abs', tol: 0.002 });
      checkValue(name, 'tint ΔE00', truth.tint.deltaE00, t.deltaE00, reading?.tint?.deltaE00, { kind: 'abs', tol: 0.5 });
    }
  }

  // ghost, from on − off and from the dark photo
  const edge = Math.ceil(3 * (truth.ghostEdgeSigma ?? truth.edgeSigma)) + 3;
  const variants: [string, Sampler | undefined, number, Reading['ghost'] | undefined][] = [
    ['ghost (on − off)', d, 0.08, reading?.variants.onMinusOff.ghost],
    ['ghost (dark)', r.y.dark, 0.06, reading?.variants.dark?.ghost],
  ];
  for (const [label, plane, tol, ghost] of variants) {
    if (!plane) continue;
    if (truth.ghost) {
      const g = truth.ghost;
      const ref = ghostRatioAt(plane, truth.screen, g.dx, g.dy, edge);
      checkValue(name, `${label} ratio`, g.ratio, ref.ratio, ghost?.ratio ?? null, { kind: 'rel', tol });
      // reference offset from the ghost's own outer edges in the photos (the scene's offset only places the strips)
      const refOffset = ghostOffsetFromEdges(plane, truth.screen, { dx: Math.round(g.dx), dy: Math.round(g.dy) }, edge);
      checkOffset(name, `${label} offset`, { dx: g.dx, dy: g.dy }, refOffset, ghost ?? null, 1.5);
    } else {
      // no ghost drawn: the reference finds no light displaced one way at the usual offset nor just past the edge zone
      // (a probe at 2·edge + 12 px leaves a band 12 px wide between the two edge zones)
      const near = 2 * edge + 12;
      const probes = [ghostRatioAt(plane, truth.screen, GHOST.dx, GHOST.dy, edge), ghostRatioAt(plane, truth.screen, near, 0, edge), ghostRatioAt(plane, truth.screen, 0, near, edge), ghostRatioAt(plane, truth.screen, -near, -near, edge)];
      expect(probes.every((p) => p.pixels > 1000), `${name}: reference probes need band pixels`).toBe(true);
      const refWorst = Math.max(...probes.map((p) => Math.abs(p.ratio)));
      const engine = ghost ? ghost.ratio : null;
      const engOk = engine === null || engine <= 0.005;
      rows.push({ scene: name, metric: `${label}: none`, truth: 'none', reference: `largest ${fmt(refWorst, 2)}`, engine: ghost ? `${fmt(ghost.ratio)} at (${ghost.dx}, ${ghost.dy})` : 'none', tolerance: '≤ 0.5% or none', verdict: engOk ? 'pass' : 'FAIL', referenceOk: refWorst <= 0.005 });
      expect.soft(refWorst <= 0.005, `${name}: reference sees ${fmt(refWorst)} of ghost light where none was drawn: the scene is not passable`).toBe(true);
      expect.soft(engOk, `${name}: engine reports a ${label} of ${fmt(engine)} at (${ghost?.dx}, ${ghost?.dy}) where none was drawn`).toBe(true);
    }
  }
}

const BASE: RealisticSceneOptions = { ghost: GHOST, withAmbient: true };

afterAll(() => {
  const header = '| scene | metric | truth | reference | engine | tolerance | engine verdict |';
  const lines = [header, '| --- | --- | --- | --- | --- | --- | --- |'];
  const cell = (t: string): string => t.replace(/\|/g, '\\|');
  for (const r of rows) lines.push(`| ${cell(r.scene)} | ${cell(r.metric)} | ${cell(r.truth)} | ${cell(r.reference)}${r.referenceOk ? '' : ' (NOT PASSABLE)'} | ${cell(r.engine)} | ${r.tolerance} | ${r.verdict} |`);
  const text = lines.join('\n');
  const path = join(tmpdir(), 'veilmeter-realism-report.md');
  writeFileSync(path, `${text}\n`);
  console.log(`${text}\n\nrealism report written to ${path}`);
});

describe('realism: one camera condition at a time', { timeout: 240_000 }, () => {
  it('sub-pixel camera creep between photos (off (0.4, 1.3) px, ambient (−1.6, 0.8) px)', async () => {
    standardChecks(await runScene('creep', { ...BASE, pose: CREEP }));
  });

  it('a 0.25° tripod nudge before the off photo is reported with its angle, and corrected or refused', async () => {
    const r = await runScene('tripod nudge 0.25°', { ...BASE, pose: { off: { dx: 0, dy: 0, rotationDeg: 0.25 }, ambient: { dx: 0.3, dy: -0.5 } } });
    const { truth } = r.capture;
    // reference: the shift of two room patches far apart on one row gives the angle
    const raw = (p: LinearPhoto): Sampler => sampler(p, 'y', (x, y) => [x, y], 1);
    const yRow = truth.height - 160;
    const left = shiftByCorrelation(raw(r.photos.on as LinearPhoto), raw(r.photos.off as LinearPhoto), { x: 100, y: yRow, w: 120, h: 90 }, 5);
    const right = shiftByCorrelation(raw(r.photos.on as LinearPhoto), raw(r.photos.off as LinearPhoto), { x: truth.width - 220, y: yRow, w: 120, h: 90 }, 5);
    // counter-clockwise as displayed (y down): the right side rises
    const refAngle = (-Math.atan2(right.dy - left.dy, truth.width - 220 - 100) * 180) / Math.PI;
    // the engine reports the angle in a field named for it, or in a warning, or refuses naming the rotation
    const numbers: number[] = [];
    const collect = (v: unknown, key: string): void => {
      if (typeof v === 'number' && /rotat|angle/i.test(key)) numbers.push(Math.abs(v));
      else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) collect(x, k);
    };
    collect(r.reading, '');
    const texts = [...(r.reading?.warnings ?? []).map((w) => `${w.code} ${w.message}`), r.error?.message ?? ''].filter((t) => /rotat/i.test(t));
    for (const t of texts) for (const m of t.matchAll(/(\d+(?:\.\d+)?)\s*°/g)) numbers.push(Number(m[1]));
    const reported = numbers.find((v) => Math.abs(v - 0.25) <= 0.1) ?? null;
    rows.push({ scene: r.name, metric: 'rotation (deg)', truth: '0.25', reference: fmt(refAngle, 3), engine: reported === null ? `not reported${texts.length ? `: ${texts.join(' / ')}` : ''}` : fmt(reported, 3), tolerance: '±0.1°', verdict: reported !== null ? 'pass' : 'FAIL', referenceOk: Math.abs(refAngle - 0.25) <= 0.1 });
    expect.soft(Math.abs(refAngle - 0.25), 'reference angle: the scene is not passable').toBeLessThanOrEqual(0.1);
    expect.soft(reported, `the 0.25° rotation is not reported (warnings: ${JSON.stringify(r.reading?.warnings)}; error: ${r.error?.message})`).not.toBeNull();
    if (r.reading) standardChecks(r, { skipRegistration: ['off'] });
    else info(r.name, 'measured', '—', `refused: ${r.error?.message}`);
  });

  it('dark photo, camera unmoved: ghost and uniformity from the dark photo', async () => {
    standardChecks(await runScene('dark unmoved', { ...BASE, withDark: true, pose: { dark: { dx: 0, dy: 0 } } }));
  });

  it('dark photo with the camera knocked by 1 px on the way to the light switch', async () => {
    standardChecks(await runScene('dark knocked 1 px', { ...BASE, withDark: true, pose: { dark: { dx: 1, dy: 0 } } }));
  });

  it('lens blur: a Gaussian point spread of σ 1.5 px over the whole photo', async () => {
    standardChecks(await runScene('lens blur σ 1.5', { ...BASE, lensBlur: 1.5 }));
  });

  it('defocused virtual image: the display light blurred by σ 4 px, its ghost with it', async () => {
    standardChecks(await runScene('defocused display σ 4', { ...BASE, defocus: 4 }));
  });

  it('cos⁴ vignetting, corners at 60%', async () => {
    standardChecks(await runScene('vignetting 60%', { ...BASE, vignetting: 0.6 }));
  });

  it('photon and read noise at ISO 800', async () => {
    standardChecks(await runScene('noise ISO 800', { ...BASE, noise: ISO800 }));
  });

  it('no ghost at all: a defocused display behind a soft lens reports none', async () => {
    standardChecks(await runScene('no ghost, defocused', { ...BASE, ghost: null, defocus: 4, lensBlur: 1.2, noise: ISO800, withDark: true }));
  });

  it('textured room with a bright screen, the camera crept by (2.3, −1.8) px', async () => {
    standardChecks(await runScene('bright screen, textured room', { ...BASE, displayLevel: 0.72, roomLevel: 0.1, pose: { off: { dx: 2.3, dy: -1.8 }, ambient: { dx: -2.6, dy: 1.4 } } }));
  });

  it('visible display pixel grid (R, G, B stripes, 3.4 px pitch), JPEG at 4:4:4', async () => {
    // Resolved colour stripes in a 4:2:0 JPEG lose 1–3% of their light (the chroma is averaged
    // gamma-encoded; measured with the reference here), which nothing downstream can restore: a
    // grid this sharp is shot at full chroma resolution or as a 16-bit TIFF.
    const options: RealisticSceneOptions = { ...BASE, pixelGrid: { pitch: 3.4, fillX: 0.8, fillY: 0.85 }, displayLevel: 0.16, lensBlur: 0.6, pose: CREEP, chromaSubsampling: '4:4:4', quality: 95 };
    standardChecks(await runScene('display pixel grid', options));
  });

  it('checkerboard pattern through a soft lens, vignetting and noise', async () => {
    standardChecks(await runScene('checkerboard', { ...BASE, pattern: 'checkerboard', lensBlur: 1.2, vignetting: 0.7, noise: ISO800, pose: CREEP }));
  });
});

describe('realism: files as cameras write them', { timeout: 240_000 }, () => {
  it('a clipped on photo bracketed with a 4× shorter exposure (EXIF exposure tags)', async () => {
    const exposures = { on: [{ exposureTime: 1 / 60, fNumber: 4, iso: 800 }, { exposureTime: 1 / 240, fNumber: 4, iso: 800 }] };
    const options: RealisticSceneOptions = { ...BASE, displayLevel: 1.4, lensBlur: 1.0, noise: ISO800, pose: CREEP, exposures };
    const r = await runScene('clipped on, bracketed', options, { onBracket: [0, 1], referenceOn: 1 });
    standardChecks(r, { clippedOn: true });
    // the long photo alone is clipped over the screen, and the engine says so
    const long = await decodeLinear((r.capture.photos.on as Buffer[])[0] as Buffer, false, false);
    const s = r.capture.truth.screen;
    let clipped = 0;
    for (let y = s.y; y < s.y + s.h; y++) for (let x = s.x; x < s.x + s.w; x++) if ((long.y[y * long.width + x] as number) > 0.95) clipped++;
    const share = clipped / (s.w * s.h);
    expect(share, 'the long exposure must clip most of the screen').toBeGreaterThan(0.5);
    const alone = await analyzeFiles({ on: { name: 'on-long.jpg', bytes: (r.capture.photos.on as Buffer[])[0] as Buffer }, off: { name: 'off.jpg', bytes: (r.capture.photos.off as Buffer[])[0] as Buffer }, background: r.capture.truth.background, artifacts: false }).then(
      (a) => a.result,
      () => null,
    );
    const warned = alone?.warnings.some((w) => w.code === 'clipped') ?? false;
    rows.push({ scene: r.name, metric: 'long photo alone warns clipped', truth: `${(100 * share).toFixed(0)}% of screen clipped`, reference: '—', engine: warned ? 'clipped' : `no: ${alone?.warnings.map((w) => w.code).join(', ')}`, tolerance: '—', verdict: warned ? 'pass' : 'FAIL', referenceOk: true });
    expect.soft(warned, 'the clipped photo alone carries the clipped warning').toBe(true);
  });

  it('16-bit linear TIFF triplet with creep, lens blur, vignetting and noise (ratios ±0.5%)', async () => {
    const r = await runScene('linear 16-bit TIFF', { ...BASE, format: 'tiff16-linear', lensBlur: 1.2, vignetting: 0.7, noise: ISO800, pose: CREEP });
    standardChecks(r, { ratioTol: 0.005 });
  });

  it('portrait camera JPEG: EXIF orientation 6, 4:2:0 chroma, quality 90', async () => {
    // the ghost here is 4%, down and to the left: nothing may assume one direction
    const ghost = { gain: 0.04, dx: -63.3, dy: 41.7, blur: 1.5 };
    const r = await runScene('portrait JPEG', { ...BASE, ghost, width: 1080, height: 1440, orientation: 6, quality: 90, chromaSubsampling: '4:2:0', lensBlur: 1.0, noise: ISO800, pose: CREEP });
    const meta = await sharp((r.capture.photos.on as Buffer[])[0] as Buffer).metadata();
    expect([meta.width, meta.height, meta.orientation, meta.chromaSubsampling]).toEqual([1440, 1080, 6, '4:2:0']);
    const size = r.reading ? `${r.reading.image.width} × ${r.reading.image.height}` : 'no reading';
    rows.push({ scene: r.name, metric: 'image as displayed', truth: '1080 × 1440', reference: `${r.photos.on?.width} × ${r.photos.on?.height}`, engine: size, tolerance: 'exact', verdict: size === '1080 × 1440' ? 'pass' : 'FAIL', referenceOk: true });
    expect.soft(size).toBe('1080 × 1440');
    standardChecks(r);
  });

  it('24 MP frame (6000 × 4000) with creep, lens blur, vignetting, noise and a ghost (timed)', async () => {
    const W = 6000;
    const H = 4000;
    const r = await runScene(
      '24 MP frame',
      {
        ...BASE,
        width: W,
        height: H,
        monochrome: true,
        ghost: { gain: 0.05, dx: 301.4, dy: 189.6, blur: 3 },
        lensBlur: 1.5,
        vignetting: 0.6,
        noise: ISO800,
        pose: { off: { dx: 1.4, dy: -0.9 }, ambient: { dx: -2.2, dy: 1.7 } },
      },
      { keepRgb: false },
    );
    standardChecks(r);
  }, 600_000);
});

describe('realism: every condition together', { timeout: 240_000 }, () => {
  const ALL: RealisticSceneOptions = {
    ...BASE,
    displayLevel: 0.6,
    defocus: 3,
    lensBlur: 1.2,
    vignetting: 0.6,
    noise: ISO800,
    withDark: true,
    pose: { ...CREEP, dark: { dx: 1, dy: 0 } },
  };

  it('creep, knocked dark photo, lens blur, defocus, vignetting, ISO 800 noise, textured room, soft ghost', async () => {
    standardChecks(await runScene('all together', ALL));
  });

  it('the same with no ghost at all', async () => {
    standardChecks(await runScene('all together, no ghost', { ...ALL, ghost: null, seed: 2 }));
  });
});
