// A DNG triplet (written by tests/fixtures/dng-writer.ts from a rendered linear scene) through the
// web upload and the rig API (a real bearer token), analysed by a real worker process: the upload
// checks the header only, the worker decodes with libraw's tools, the reading matches what the CLI
// reads from the same files and the scene's linear truth within 0.5%. A damaged raw file is
// refused at upload with one line and leaves nothing behind.
import { spawnSync } from 'node:child_process';
import { readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { renderDngCapture, type DngCapture } from '../fixtures/dng-writer';
import { isolateRun } from '../fixtures/isolated-run';
import { jar } from '../fixtures/request-context';
import { webLabHarness, type WebLab } from '../fixtures/web-lab';
import { call, captureRoutes, type Handler } from '../fixtures/capture-routes';

const root = join(import.meta.dirname, '..', '..');
// environment first: lib/env.ts reads it once, at first use
const { tmp, prefix, storageDir } = isolateRun('raw');

vi.mock('server-only', () => ({}));
vi.mock('next/headers', () => import('../fixtures/request-context').then((m) => m.nextHeaders));

const { getReadingForAnalysis } = await import('../../db/queries/readings');
const { createSet, uploadPhoto, regions, onePhoto, analyses, rigCreateSet, rigUpload, rigRegions, rigAnalyses } = await captureRoutes();

const harness = webLabHarness({ tmp, prefix, storageDir }, { name: 'Raw path', project: 'Raw bench', revision: 'R1', tokenName: 'raw rig', cliTag: 'raw' });
const cliDir = harness.cliDir;
let lab: WebLab;
let token = '';
const ROLES = ['on', 'off', 'ambient'] as const;

const waitDone = (analysisId: string) => harness.waitDone(analysisId);

type Scene = { capture: DngCapture; paths: Record<(typeof ROLES)[number], string> };
async function scene(seed: number, tag: string): Promise<Scene> {
  // the camera's automatic white balance drifted between shots: each photo has its own as-shot neutral
  const capture = await renderDngCapture({ width: 640, height: 480, seed, noise: { fullScaleElectrons: 20000, readElectrons: 3 } }, {}, { off: { asShotNeutral: [0.3, 1, 0.9] }, ambient: { asShotNeutral: [0.9, 1, 0.35] } });
  const paths = { on: join(tmp, `${tag}-on.dng`), off: join(tmp, `${tag}-off.dng`), ambient: join(tmp, `${tag}-ambient.dng`) };
  for (const r of ROLES) writeFileSync(paths[r], capture.photos[r] as Buffer);
  return { capture, paths };
}

/** The CLI's reading of the same files with the same regions. */
function cli(s: Scene): Record<string, unknown> {
  const t = s.capture.truth;
  const args = [join(cliDir, 'cli', 'veilmeter.mjs'), 'analyze', '--on', s.paths.on, '--off', s.paths.off, '--ambient', s.paths.ambient];
  args.push('--screen', `${t.screen.x},${t.screen.y},${t.screen.w},${t.screen.h}`, '--background', `${t.background.x},${t.background.y},${t.background.w},${t.background.h}`, '--json');
  const r = spawnSync(process.execPath, args, { cwd: root, encoding: 'utf8', timeout: 120_000 });
  if (r.status !== 0) throw new Error(`CLI failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as Record<string, unknown>;
}

const rel = (a: unknown, b: number) => Math.abs((a as number) / b - 1);

function checkTruth(result: Record<string, unknown>, s: Scene): void {
  const t = s.capture.truth;
  // 0.5%: the accuracy asked of raw photos on generated scenes, as of linear TIFFs
  expect(rel(result.ambientContrastRatio, t.ambientContrastRatio), 'contrast ratio').toBeLessThan(0.005);
  expect(rel(result.transmission, t.transmission), 'transmission').toBeLessThan(0.005);
  expect(rel(result.michelson, t.michelson), 'Michelson').toBeLessThan(0.005);
}

/** The engine's reading without the keys the worker adds (camera profile, how photos were read). */
function engineKeys(result: Record<string, unknown>): Record<string, unknown> {
  const { decodedAs: _d, cameraProfile: _c, ...rest } = result;
  return rest;
}

const storedFiles = (): string[] => {
  const out: string[] = [];
  const walk = (d: string): void => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      if (e.isDirectory()) walk(join(d, e.name));
      else out.push(e.name);
    }
  };
  try {
    walk(storageDir);
  } catch {
    // no folder yet: nothing stored
  }
  return out;
};

beforeAll(async () => {
  await harness.setUp();
  lab = harness.lab;
  token = harness.token;
}, 150_000);

afterAll(async () => {
  await harness.tearDown();
});

describe('camera raw photos through the web and the rig API', () => {
  it('the web upload takes a DNG triplet; the worker decodes it with one white balance and reads what the CLI reads, within 0.5% of the truth', async () => {
    const s = await scene(71, 'web');
    const base = 'http://127.0.0.1/api/captures';
    const created = await call(createSet.POST as Handler, 'POST', base, {}, JSON.stringify({ revisionId: lab.revisionId, label: 'Raw web' }), { 'content-type': 'application/json' });
    expect(created.status).toBe(201);
    const set = created.json.captureSet as { id: string };
    for (const role of ROLES) {
      const up = await call(uploadPhoto.POST as Handler, 'POST', `${base}/${set.id}/photos?role=${role}`, { captureId: set.id }, new Uint8Array(s.capture.photos[role] as Buffer), { 'x-file-name': `web-${role}.dng` });
      expect(up.status, JSON.stringify(up.json)).toBe(201);
      expect(up.json.photo).toMatchObject({ format: 'dng', bitDepth: 16, width: 640, height: 480, encodingFile: 'linear', pages: 1 });
      // exposure tags, make and model read from the raw file itself
      expect((up.json.photo as { exif: unknown }).exif).toMatchObject({ exposureTime: 1 / 60, fNumber: 4, iso: 800, make: 'Veilmeter Fixture Optics', model: 'Bayer Mosaic DNG-1' });
    }
    // nothing to declare for a raw photo: it is always linear
    const onId = ((await call(uploadPhoto.POST as Handler, 'POST', `${base}/${set.id}/photos?role=on`, { captureId: set.id }, new Uint8Array(s.capture.photos.on as Buffer), { 'x-file-name': 'web-on.dng' })).json.photo as { id: string }).id;
    const declared = await call(onePhoto.PATCH as Handler, 'PATCH', `${base}/${set.id}/photos/${onId}`, { captureId: set.id, photoId: onId }, JSON.stringify({ encoding: 'srgb' }), { 'content-type': 'application/json' });
    expect(declared.status).toBe(422);
    expect((declared.json.error as { message: string }).message).toMatch(/web-on\.dng is a camera raw file, which is always read as linear light/);
    // the original under a .dng key and a WebP preview per photo
    const stored = storedFiles();
    expect(stored.filter((f) => f.endsWith('.dng'))).toHaveLength(3);
    expect(stored.filter((f) => !f.endsWith('.dng'))).toHaveLength(3);
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
    const wb = result.rawWhiteBalance as { source: string; multipliers: number[] };
    expect(wb.source).toBe('daylight');
    // the fixture camera's daylight multipliers: green over its response to white per channel (derived)
    expect(wb.multipliers[0]).toBeCloseTo(1 / 0.6, 2);
    expect(wb.multipliers[2]).toBeCloseTo(1 / 0.7, 2);
    expect(engineKeys(result)).toEqual(cli(s));
    checkTruth(result, s);
  }, 240_000);

  it('the rig API refuses a damaged raw file with one line and stores nothing, then takes a good triplet', async () => {
    const s = await scene(72, 'rig');
    const base = 'http://127.0.0.1/api/v1/captures';
    const auth = { authorization: `Bearer ${token}` };
    jar.clear(); // no session: the token alone
    const created = await call(rigCreateSet.POST as Handler, 'POST', base, {}, JSON.stringify({ revisionId: lab.revisionId, label: 'Raw rig' }), { ...auth, 'content-type': 'application/json' });
    expect(created.status, JSON.stringify(created.json)).toBe(201);
    const set = created.json.captureSet as { id: string };
    const before = storedFiles().length;
    const on = s.capture.photos.on as Buffer;
    const cut = await call(rigUpload.POST as Handler, 'POST', `${base}/${set.id}/photos?role=on`, { captureId: set.id }, new Uint8Array(on.subarray(0, Math.floor(on.length * 0.6))), { ...auth, 'x-file-name': 'cut-on.dng' });
    expect(cut.status).toBe(422);
    const message = (cut.json.error as { message: string }).message;
    expect(message).toMatch(/^cut-on\.dng /);
    expect(message).not.toContain('\n');
    expect(message).not.toMatch(/veilmeter-raw-|\/tmp\//);
    expect(storedFiles().length).toBe(before);

    for (const role of ROLES) {
      const up = await call(rigUpload.POST as Handler, 'POST', `${base}/${set.id}/photos?role=${role}`, { captureId: set.id }, new Uint8Array(s.capture.photos[role] as Buffer), { ...auth, 'x-file-name': `rig-${role}.dng` });
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
    expect(engineKeys(result)).toEqual(cli(s));
    checkTruth(result, s);
  }, 240_000);
});
