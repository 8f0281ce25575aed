// A linear 16-bit TIFF triplet through the web routes and the rig API (a real bearer token), analysed
// by a real worker process, must read exactly what the CLI reads with --linear16 on the same files,
// and match the generator's linear truth within 0.5%.
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { jar } from '../fixtures/request-context';
import { encodeTiff16 } from '../fixtures/tiff16';
import { webLabHarness, type WebLab } from '../fixtures/web-lab';
import { call, captureRoutes, type Handler } from '../fixtures/capture-routes';
import { isolateRun } from '../fixtures/isolated-run';

const root = join(import.meta.dirname, '..', '..');
// environment first: lib/env.ts reads it once, at first use
const { tmp, prefix, storageDir } = isolateRun('linear');

vi.mock('server-only', () => ({}));
vi.mock('next/headers', () => import('../fixtures/request-context').then((m) => m.nextHeaders));

const { getDb } = await import('../../db/index');
const { getReadingForAnalysis } = await import('../../db/queries/readings');
const { createSet, uploadPhoto, regions, analyses, rigCreateSet, rigUpload, rigRegions, rigAnalyses } = await captureRoutes();

/** sRGB-encoded 16-bit codes to linear 16-bit codes (IEC 61966-2-1 decoding, published). */
async function toLinearTiff(srgbTiff: Buffer): Promise<Buffer> {
  const { data, info } = await sharp(srgbTiff).toColourspace('rgb16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true });
  const codes = new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2);
  const table = new Uint16Array(65536);
  for (let c = 0; c < 65536; c++) {
    const v = c / 65535;
    table[c] = Math.round(65535 * (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  }
  return encodeTiff16(codes.map((c) => table[c] as number), info.width, info.height);
}

const harness = webLabHarness({ tmp, prefix, storageDir }, { name: 'Linear path', project: 'Linear bench', revision: 'L1', tokenName: 'linear rig', cliTag: 'linear' });
const cliDir = harness.cliDir;
let lab: WebLab;
let token = '';

const waitDone = (analysisId: string) => harness.waitDone(analysisId);

type Scene = { capture: RenderedCapture; files: Record<'on' | 'off' | 'ambient', Buffer>; paths: Record<'on' | 'off' | 'ambient', string> };
async function scene(seed: number, tag: string): Promise<Scene> {
  const capture = await renderCapture({ width: 480, height: 360, seed, format: 'tiff16', exposures: { on: null, off: null, ambient: null } });
  const files = { on: await toLinearTiff(capture.on), off: await toLinearTiff(capture.off), ambient: await toLinearTiff(capture.ambient) };
  const paths = { on: join(tmp, `${tag}-on.tif`), off: join(tmp, `${tag}-off.tif`), ambient: join(tmp, `${tag}-ambient.tif`) };
  for (const r of ['on', 'off', 'ambient'] as const) writeFileSync(paths[r], files[r]);
  return { capture, files, paths };
}

/** The CLI's reading of the same files with the same regions. */
function cli(s: Scene, linear: boolean): Record<string, unknown> {
  const t = s.capture.truth;
  const args = [join(cliDir, 'cli', 'veilmeter.mjs'), 'analyze', '--on', s.paths.on, '--off', s.paths.off, '--ambient', s.paths.ambient];
  args.push('--screen', `${t.screen.x},${t.screen.y},${t.screen.w},${t.screen.h}`, '--background', `${t.background.x},${t.background.y},${t.background.w},${t.background.h}`, '--json');
  if (linear) args.push('--linear16');
  const r = spawnSync(process.execPath, args, { cwd: root, encoding: 'utf8', timeout: 90_000 });
  if (r.status !== 0) throw new Error(`CLI failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as Record<string, unknown>;
}

const rel = (a: unknown, b: number) => Math.abs((a as number) / b - 1);

function checkTruth(result: Record<string, unknown>, s: Scene): void {
  const t = s.capture.truth;
  expect(rel(result.ambientContrastRatio, t.ambientContrastRatio), 'contrast ratio').toBeLessThan(0.005);
  expect(rel(result.transmission, t.transmission), 'transmission').toBeLessThan(0.005);
  expect(rel(result.michelson, t.michelson), 'Michelson').toBeLessThan(0.005);
  // the ghost within the tolerance for a detected ghost (±8%), at its offset within 1.5 px
  const g = result.ghost as { ratio: number; dx: number; dy: number } | null;
  const tg = t.ghost as { ratio: number; dx: number; dy: number };
  expect(rel(g?.ratio, tg.ratio), 'ghost ratio').toBeLessThan(0.08);
  expect(Math.hypot((g?.dx ?? 1e9) - tg.dx, (g?.dy ?? 1e9) - tg.dy), 'ghost offset').toBeLessThanOrEqual(1.5);
}

/** The engine's reading without the keys the worker adds (camera profile, how photos were read). */
function engineKeys(result: Record<string, unknown>): Record<string, unknown> {
  const { decodedAs: _d, cameraProfile: _c, ...rest } = result;
  return rest;
}

beforeAll(async () => {
  await harness.setUp();
  lab = harness.lab;
  token = harness.token;
}, 150_000);

afterAll(async () => {
  await harness.tearDown();
});

describe('linear 16-bit TIFFs through the web and the rig API', () => {
  it('the web path reads a bare 16-bit TIFF as linear by default and equals the CLI with --linear16', async () => {
    const s = await scene(61, 'web');
    const base = 'http://127.0.0.1/api/captures';
    const created = await call(createSet.POST as Handler, 'POST', base, {}, JSON.stringify({ revisionId: lab.revisionId, label: 'Linear web' }), { 'content-type': 'application/json' });
    expect(created.status).toBe(201);
    const set = created.json.captureSet as { id: string; tiffEncoding: string };
    expect(set.tiffEncoding).toBe('auto');
    for (const role of ['on', 'off', 'ambient'] as const) {
      const up = await call(uploadPhoto.POST as Handler, 'POST', `${base}/${set.id}/photos?role=${role}`, { captureId: set.id }, new Uint8Array(s.files[role]), { 'x-file-name': `web-${role}.tif` });
      expect(up.status, JSON.stringify(up.json)).toBe(201);
      expect(up.json.photo).toMatchObject({ format: 'tiff', bitDepth: 16, encodingFile: 'linear', encodingDeclared: null, pages: 1 });
    }
    const t = s.capture.truth;
    const put = await call(regions.PUT as Handler, 'PUT', `${base}/${set.id}/regions`, { captureId: set.id }, JSON.stringify({ regions: [{ kind: 'screen', ...t.screen }, { kind: 'background', ...t.background }] }));
    expect(put.status).toBe(200);
    const queued = await call(analyses.POST as Handler, 'POST', `${base}/${set.id}/analyses`, { captureId: set.id });
    expect(queued.status).toBe(202);
    const done = await waitDone((queued.json.analysis as { id: string }).id);
    expect(done.status, done.error ?? '').toBe('done');
    const reading = await getReadingForAnalysis(lab.labId, done.id);
    const result = reading?.result as unknown as Record<string, unknown>;
    expect(result.decodedAs).toEqual({ on: 'linear', off: 'linear', ambient: 'linear' });
    expect(engineKeys(result)).toEqual(cli(s, true));
    checkTruth(result, s);
    // the same files read as sRGB are far off: the declaration is what makes the numbers right
    expect(rel(cli(s, false).ambientContrastRatio, t.ambientContrastRatio)).toBeGreaterThan(0.05);
  }, 180_000);

  it('the rig API takes a set declared linear with a bearer token and equals the CLI with --linear16', async () => {
    const s = await scene(62, 'rig');
    const base = 'http://127.0.0.1/api/v1/captures';
    const auth = { authorization: `Bearer ${token}` };
    jar.clear(); // no session: the token alone
    const created = await call(rigCreateSet.POST as Handler, 'POST', base, {}, JSON.stringify({ revisionId: lab.revisionId, label: 'Linear rig', tiffEncoding: 'linear' }), { ...auth, 'content-type': 'application/json' });
    expect(created.status, JSON.stringify(created.json)).toBe(201);
    const set = created.json.captureSet as { id: string; tiffEncoding: string };
    expect(set.tiffEncoding).toBe('linear');
    for (const role of ['on', 'off', 'ambient'] as const) {
      const up = await call(rigUpload.POST as Handler, 'POST', `${base}/${set.id}/photos?role=${role}`, { captureId: set.id }, new Uint8Array(s.files[role]), { ...auth, 'x-file-name': `rig-${role}.tif` });
      expect(up.status, JSON.stringify(up.json)).toBe(201);
    }
    const t = s.capture.truth;
    const put = await call(rigRegions.PUT as Handler, 'PUT', `${base}/${set.id}/regions`, { captureId: set.id }, JSON.stringify({ regions: [{ kind: 'screen', ...t.screen }, { kind: 'background', ...t.background }] }), auth);
    expect(put.status, JSON.stringify(put.json)).toBe(200);
    const queued = await call(rigAnalyses.POST as Handler, 'POST', `${base}/${set.id}/analyses`, { captureId: set.id }, undefined, auth);
    expect(queued.status, JSON.stringify(queued.json)).toBe(202);
    const done = await waitDone((queued.json.analysis as { id: string }).id);
    expect(done.status, done.error ?? '').toBe('done');
    const reading = await getReadingForAnalysis(lab.labId, done.id);
    const result = reading?.result as unknown as Record<string, unknown>;
    expect(result.decodedAs).toEqual({ on: 'linear', off: 'linear', ambient: 'linear' });
    expect(engineKeys(result)).toEqual(cli(s, true));
    checkTruth(result, s);
  }, 180_000);

  it('refuses to declare a JPEG linear, and a linear set holding a JPEG cannot be analysed', async () => {
    const jpeg = await renderCapture({ width: 480, height: 360, seed: 63 });
    const base = 'http://127.0.0.1/api/v1/captures';
    const auth = { authorization: `Bearer ${token}` };
    const created = await call(rigCreateSet.POST as Handler, 'POST', base, {}, JSON.stringify({ revisionId: lab.revisionId, label: 'Linear JPEG', tiffEncoding: 'linear' }), { ...auth, 'content-type': 'application/json' });
    const set = created.json.captureSet as { id: string };
    const declared = await call(rigUpload.POST as Handler, 'POST', `${base}/${set.id}/photos?role=on&encoding=linear`, { captureId: set.id }, new Uint8Array(jpeg.on), { ...auth, 'x-file-name': 'on.jpg' });
    expect(declared.status).toBe(422);
    expect((declared.json.error as { message: string }).message).toMatch(/on\.jpg is an 8-bit JPEG, so it cannot be declared linear/);
    const bad = await call(rigCreateSet.POST as Handler, 'POST', base, {}, JSON.stringify({ revisionId: lab.revisionId, label: 'Bad', tiffEncoding: 'gamma' }), { ...auth, 'content-type': 'application/json' });
    expect(bad.status).toBe(422);
    for (const role of ['on', 'off'] as const) {
      const up = await call(rigUpload.POST as Handler, 'POST', `${base}/${set.id}/photos?role=${role}`, { captureId: set.id }, new Uint8Array(jpeg[role]), { ...auth, 'x-file-name': `${role}.jpg` });
      expect(up.status).toBe(201);
    }
    const queued = await call(rigAnalyses.POST as Handler, 'POST', `${base}/${set.id}/analyses`, { captureId: set.id }, undefined, auth);
    expect(queued.status).toBe(422);
    expect((queued.json.error as { message: string }).message).toMatch(/declared linear 16-bit, but the on photo on\.jpg is an 8-bit JPEG/);
    expect(await getDb()('analyses').where({ lab_id: lab.labId, capture_set_id: set.id })).toHaveLength(0);
  });
});
