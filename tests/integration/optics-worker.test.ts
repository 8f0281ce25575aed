// Sharpness, field of view and display colour from upload to reading: a slanted-edge capture set, a
// camera profile with its degrees per pixel and a stack whose display gives its resolution and white,
// analysed by the worker's processor against real PostgreSQL and a storage folder.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderOpticsScene } from '../fixtures/optics-scene';
import { gaussianMtf50 } from '../fixtures/slanted-edge';
import { createTestLab } from '../fixtures/test-lab';

const tmp = mkdtempSync(join(tmpdir(), 'vm-optics-'));
process.env.STORAGE_DIR = join(tmp, 'storage');
process.env.STORAGE_DRIVER = 'local';

const { getDb, closeDb } = await import('../../db/index');
const cameras = await import('../../db/queries/camera-profiles');
const { saveRevisionStack } = await import('../../db/queries/stacks');
const { createAnalysis } = await import('../../db/queries/analyses');
const { getReadingForAnalysis } = await import('../../db/queries/readings');
const { ingestPhoto } = await import('../../lib/server/storage/ingest-photo');
const { runAnalysis } = await import('../../worker/processors/run-analysis');

const SIGMA = 2;
const details = { patch: { x: 1, y: 1, w: 10, h: 10 }, meterCdm2: 250, meanY: 0.4, exposure: { exposureTime: 0.01, fNumber: 8, iso: 100, factor: 0.015625 }, photoName: 'patch.jpg', imageWidth: 1200, imageHeight: 800 };
let lab: { labId: string; userId: string; projectId: string; revisionId: string };
let other = '';

/** Linear 16-bit codes to an 8-bit sRGB JPEG with the camera's make and model in its EXIF (IEC 61966-2-1 encoding). */
async function jpeg(raster: { data: Uint8Array | Uint16Array; width: number; height: number }): Promise<Buffer> {
  const out = new Uint8Array(raster.data.length);
  for (let i = 0; i < out.length; i++) {
    const v = (raster.data[i] as number) / 65535;
    out[i] = Math.round(255 * (v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055));
  }
  return sharp(out, { raw: { width: raster.width, height: raster.height, channels: 3 } })
    .jpeg({ quality: 97, chromaSubsampling: '4:4:4' })
    .withExif({ IFD0: { Make: 'Invented Optics', Model: 'Edge Bench 2' } })
    .toBuffer();
}

beforeAll(async () => {
  const tag = Math.random().toString(36).slice(2, 8);
  lab = await createTestLab(getDb(), { tag: `optics-${tag}`, name: 'Optics', project: 'Edge visor', revision: 'E1' });
  other = ((await getDb()('labs').insert({ name: `Optics other ${tag}` }).returning<{ id: string }[]>('id'))[0] as { id: string }).id;
}, 60_000);

afterAll(async () => {
  if (lab) {
    await getDb()('labs').whereIn('id', [lab.labId, other]).delete();
    await getDb()('users').where({ id: lab.userId }).delete();
  }
  await closeDb();
  rmSync(tmp, { recursive: true, force: true });
});

describe('optics readings end to end', () => {
  it('keeps a camera profile’s degrees per pixel within its lab, audited, and bounded by the database', async () => {
    const p = await cameras.saveCameraCalibration(lab.labId, lab.userId, { make: 'Invented Optics', model: 'Edge Bench 2', name: 'Edge bench', k: 600, calibration: details });
    expect(p.degreesPerPixel).toBeNull();
    expect(await cameras.setCameraDegreesPerPixel(other, lab.userId, p.id, 0.01)).toBeNull();
    expect((await cameras.setCameraDegreesPerPixel(lab.labId, lab.userId, p.id, 0.01))?.degreesPerPixel).toBe(0.01);
    await expect(getDb()('camera_profiles').where({ id: p.id }).update({ degrees_per_pixel: 2 })).rejects.toMatchObject({ code: '23514' });
    const actions = (await getDb()('audit_events').where({ lab_id: lab.labId, target_id: p.id }).orderBy('id')).map((e) => e.action);
    expect(actions).toEqual(['camera.calibrate', 'camera.angle']);
  });

  it('accepts the slanted-edge pattern on a capture set and refuses an unknown one', async () => {
    await expect(getDb()('capture_sets').insert({ lab_id: lab.labId, revision_id: lab.revisionId, label: 'bad', pattern: 'stripes' })).rejects.toMatchObject({ code: '23514' });
  });

  it('reads MTF50, the field of view from the profile, pixels per degree and Δu′v′ from the stack’s display', async () => {
    await saveRevisionStack(lab.labId, lab.userId, lab.revisionId, {
      elements: [
        { kind: 'display', luminance: 1500, polarisation: { kind: 'none' }, resolution: { width: 1280, height: 720 }, white: { x: 0.3, y: 0.32 } },
        { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.65 },
      ],
    });
    const [row] = await getDb()('capture_sets').insert({ lab_id: lab.labId, revision_id: lab.revisionId, label: 'edge', pattern: 'slanted-edge', created_by: lab.userId }).returning<{ id: string }[]>('id');
    const setId = (row as { id: string }).id;
    const s = renderOpticsScene({ width: 1200, height: 800, screen: { x: 300, y: 200, w: 600, h: 400 }, pattern: 'slanted-edge', white: [0.45, 0.42, 0.4], sigma: SIGMA, room: 0.1, noise: 0.002, seed: 77 });
    for (const role of ['on', 'off'] as const) await ingestPhoto({ labId: lab.labId, userId: lab.userId, captureSetId: setId, role, name: `edge-${role}.jpg`, bytes: await jpeg(s[role]) });
    const analysis = await createAnalysis(lab.labId, lab.userId, setId);
    const out = await runAnalysis(lab.labId, analysis.id);
    expect(out.status).toBe('done');
    const r = (await getReadingForAnalysis(lab.labId, analysis.id))?.result;
    // MTF50 of a Gaussian blur, √(ln 2 / (2π²σ²)) (derived); 8-bit JPEG costs a little, so 5% here
    expect(Math.abs((r?.sharpness?.mtf50 as number) / gaussianMtf50(SIGMA) - 1)).toBeLessThan(0.05);
    expect(r?.geometry?.source).toBe('camera-profile');
    // 600 px at 0.01° per pixel through a pinhole: 2·atan(300·tan 0.01°) (derived)
    expect(r?.geometry?.fovH).toBeCloseTo((2 * Math.atan(300 * Math.tan((0.01 * Math.PI) / 180)) * 180) / Math.PI, 1);
    expect(r?.geometry?.pixelsPerDegree).toBeCloseTo(1280 / (r?.geometry?.fovH as number), 0);
    expect(r?.sharpness?.mtf50PerDegree).toBeCloseTo((r?.sharpness?.mtf50 as number) / 0.01, 0);
    expect(r?.displayColour?.whiteRef).toBe('display');
  }, 120_000);
});
