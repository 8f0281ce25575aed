// Camera profiles and brackets against real PostgreSQL and a real storage folder.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderCapture, type ExposureSetting } from '../fixtures/capture-generator';
import { createTestLab } from '../fixtures/test-lab';

const tmp = mkdtempSync(join(tmpdir(), 'vm-cameras-'));
process.env.STORAGE_DIR = join(tmp, 'storage');

type Mods = { db: typeof import('../../db/index'); ingest: typeof import('../../lib/server/storage/ingest-photo'); photos: typeof import('../../db/queries/photos'); cameras: typeof import('../../db/queries/camera-profiles'); image: typeof import('../../lib/image') };
let m: Mods;
const labs: string[] = [];
let userId = '';
let setId = '';

const REF: ExposureSetting = { exposureTime: 1 / 100, fNumber: 8, iso: 100 };
const SHORT: ExposureSetting = { exposureTime: 1 / 1600, fNumber: 8, iso: 100 };
const LONG: ExposureSetting = { exposureTime: 0.16, fNumber: 8, iso: 100 };

const details = { patch: { x: 1, y: 1, w: 10, h: 10 }, meterCdm2: 250, meanY: 0.4, exposure: { ...REF, factor: 0.015625 }, photoName: 'patch.jpg', imageWidth: 400, imageHeight: 300 };

beforeAll(async () => {
  m = { db: await import('../../db/index'), ingest: await import('../../lib/server/storage/ingest-photo'), photos: await import('../../db/queries/photos'), cameras: await import('../../db/queries/camera-profiles'), image: await import('../../lib/image') };
  const db = m.db.getDb();
  const tag = Math.random().toString(36).slice(2, 8);
  const a = await createTestLab(db, { tag: `cameras-${tag}`, name: 'Camera Test', project: 'Cameras', revision: 'C1' });
  userId = a.userId;
  labs.push(a.labId, ((await db('labs').insert({ name: `Camera test B ${tag}` }).returning<{ id: string }[]>('id'))[0] as { id: string }).id);
  setId = ((await db('capture_sets').insert({ lab_id: labs[0], revision_id: a.revisionId, label: 'bracket' }).returning<{ id: string }[]>('id'))[0] as { id: string }).id;
});

afterAll(async () => {
  if (labs.length) await m.db.getDb()('labs').whereIn('id', labs).delete();
  if (userId) await m.db.getDb()('users').where({ id: userId }).delete();
  await m?.db.closeDb();
  rmSync(tmp, { recursive: true, force: true });
});

describe('camera profiles', () => {
  it('match photos by EXIF make and model whatever their case and padding, within the lab only', async () => {
    const [a, b] = labs as [string, string];
    const saved = await m.cameras.saveCameraCalibration(a, userId, { make: 'Veilmeter Fixtures ', model: 'Fixture  Camera', name: 'Bench A', k: 640, calibration: details });
    expect(saved.k).toBe(640);
    expect((await m.cameras.findCameraProfile(a, 'VEILMETER FIXTURES', 'fixture camera'))?.id).toBe(saved.id);
    expect(await m.cameras.findCameraProfile(b, 'Veilmeter Fixtures', 'Fixture Camera')).toBeNull();
    expect(await m.cameras.findCameraProfile(a, undefined, 'Fixture Camera')).toBeNull();
    // a recalibration replaces the factor, not the row
    const again = await m.cameras.saveCameraCalibration(a, userId, { make: 'veilmeter fixtures', model: 'fixture camera', name: 'Bench A', k: 655, calibration: details });
    expect(again.id).toBe(saved.id);
    expect((await m.cameras.listCameraProfiles(a)).map((p) => p.k)).toEqual([655]);
    expect(await m.cameras.deleteCameraProfile(b, userId, saved.id)).toBe(false);
    expect(await m.cameras.getCameraProfile(b, saved.id)).toBeNull();
    const actions = (await m.db.getDb()('audit_events').where({ lab_id: a, target_id: saved.id }).orderBy('id')).map((e) => e.action);
    expect(actions).toEqual(['camera.calibrate', 'camera.calibrate']);
  });

  it('refuse a non-positive factor in the database itself', async () => {
    await expect(m.cameras.saveCameraCalibration(labs[0] as string, userId, { make: 'X', model: 'Y', name: 'bad', k: 0, calibration: details })).rejects.toMatchObject({ code: '23514' });
  });
});

describe('brackets at intake and in the engine', () => {
  it('keep photos of one role at different exposures, treat an identical file as a duplicate and a same-exposure reshoot as a replacement', async () => {
    const labId = labs[0] as string;
    const shots = await Promise.all([REF, SHORT, LONG].map((e, i) => renderCapture({ width: 320, height: 240, seed: 40 + i, ghost: null, exposures: { on: e, off: e, ambient: e } })));
    const [ref, short, long] = shots as [(typeof shots)[0], (typeof shots)[0], (typeof shots)[0]];
    const up = (name: string, bytes: Uint8Array) => m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name, bytes });
    expect((await up('on-ref.jpg', ref.on)).bracketSize).toBe(1);
    expect((await up('on-short.jpg', short.on)).bracketSize).toBe(2);
    expect((await up('on-long.jpg', long.on)).bracketSize).toBe(3);
    expect((await up('on-short-copy.jpg', short.on)).duplicate).toBe(true);
    // another picture at the reference exposure replaces the first reference shot
    const reshoot = await renderCapture({ width: 320, height: 240, seed: 99, ghost: null, exposures: { on: REF, off: REF, ambient: REF } });
    expect((await up('on-ref-2.jpg', reshoot.on)).bracketSize).toBe(3);
    const names = (await m.photos.listPhotos(labId, setId)).filter((p) => p.role === 'on').map((p) => p.originalName);
    expect(names.sort()).toEqual(['on-long.jpg', 'on-ref-2.jpg', 'on-short.jpg']);
  });

  it('merge brackets given as files and convert with a camera factor', async () => {
    const shots = await Promise.all([REF, SHORT, LONG].map((e) => {
      const s = (e.exposureTime * e.iso) / (e.fNumber * e.fNumber) / ((REF.exposureTime * REF.iso) / (REF.fNumber * REF.fNumber));
      return renderCapture({ width: 320, height: 240, seed: 11, displayLevel: 2.8 * s, backgroundLevel: 0.004 * s, veil: 0, ghost: null, noise: 0.001, exposures: { on: e, off: e, ambient: e } });
    }));
    const truth = (shots[0] as (typeof shots)[0]).truth;
    const src = (role: 'on' | 'off') => shots.map((s, i) => ({ name: `${role}-${i}.jpg`, bytes: s[role] }));
    const { result } = await m.image.analyzeFiles({ on: src('on'), off: src('off'), screen: truth.screen, ghostOffset: 'none', calibration: 640, artifacts: false });
    expect(Math.abs((result.ambientContrastRatio as number) / truth.ambientContrastRatio - 1)).toBeLessThan(0.02);
    expect(result.brackets?.on?.count).toBe(3);
    expect(result.absoluteLuminance?.kind).toBe('calibrated');
    // L = k·Y/E on the reference exposure (docs/method.md §5.4)
    expect(Math.abs((result.absoluteLuminance?.on as number) / ((640 * truth.luminance.on) / 0.015625) - 1)).toBeLessThan(0.02);
  });
});
