// Replacing and removing photos against real PostgreSQL and a real storage folder: a replacement
// takes the old photo's place whatever its exposure, is size-checked without it, leaves no file
// behind when refused, and the set records when its photos changed so older readings can say so.
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { createTestLab } from '../fixtures/test-lab';

const tmp = mkdtempSync(join(tmpdir(), 'vm-replace-'));
process.env.STORAGE_DIR = join(tmp, 'storage');

type Mods = {
  db: typeof import('../../db/index');
  ingest: typeof import('../../lib/server/storage/ingest-photo');
  photos: typeof import('../../db/queries/photos');
  changes: typeof import('../../db/queries/photo-changes');
  storage: typeof import('../../lib/server/storage');
  thumb: typeof import('../../lib/image/thumbnail');
  errors: typeof import('../../lib/errors');
};
let m: Mods;
let labId = '';
let userId = '';
let revisionId = '';
let seed = 40;

// each file may be stored once per lab, so every test renders photos of its own
async function scenes(): Promise<{ small: RenderedCapture; other: RenderedCapture; large: RenderedCapture }> {
  seed += 3;
  return {
    small: await renderCapture({ width: 400, height: 300, seed }),
    // the same size at another exposure: a new upload of its on photo would join the on photo's bracket
    other: await renderCapture({ width: 400, height: 300, seed: seed + 1, exposures: { on: { exposureTime: 1 / 50, fNumber: 8, iso: 100 } } }),
    large: await renderCapture({ width: 480, height: 360, seed: seed + 2 }),
  };
}

function filesIn(dir: string): string[] {
  try {
    return readdirSync(dir).flatMap((n) => (statSync(join(dir, n)).isDirectory() ? filesIn(join(dir, n)) : [join(dir, n)]));
  } catch {
    return [];
  }
}

async function newSet(label: string): Promise<string> {
  const [row] = await m.db.getDb()('capture_sets').insert({ lab_id: labId, revision_id: revisionId, label }).returning<{ id: string }[]>('id');
  return (row as { id: string }).id;
}

async function refusal(p: Promise<unknown>): Promise<{ status: number; message: string; code: string }> {
  try {
    await p;
  } catch (e) {
    if (e instanceof m.errors.AppError) return { status: e.status, message: e.message, code: e.code };
    throw e;
  }
  throw new Error('accepted');
}

beforeAll(async () => {
  m = {
    db: await import('../../db/index'),
    ingest: await import('../../lib/server/storage/ingest-photo'),
    photos: await import('../../db/queries/photos'),
    changes: await import('../../db/queries/photo-changes'),
    storage: await import('../../lib/server/storage'),
    thumb: await import('../../lib/image/thumbnail'),
    errors: await import('../../lib/errors'),
  };
  const tag = Math.random().toString(36).slice(2, 8);
  ({ labId, userId, revisionId } = await createTestLab(m.db.getDb(), { tag: `replace-${tag}`, name: 'Replace Test', project: 'Replacements', revision: 'R1' }));
});

afterAll(async () => {
  if (labId) {
    await m.db.getDb()('labs').where({ id: labId }).delete();
    await m.db.getDb()('users').where({ id: userId }).delete();
  }
  await m?.db.closeDb();
  rmSync(tmp, { recursive: true, force: true });
});

describe('replacing a photo', () => {
  it('puts the new file in the old one’s place even at another exposure, and deletes the old files', async () => {
    const { small, other } = await scenes();
    const setId = await newSet('replace at another exposure');
    const { photo: old } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'first-on.jpg', bytes: small.on });
    const before = filesIn(join(tmp, 'storage')).length;
    const { photo: next, duplicate } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'second-on.jpg', bytes: other.on, replaces: old.id });
    expect(duplicate).toBe(false);
    const list = await m.photos.listPhotos(labId, setId);
    expect(list.map((p) => [p.id, p.role, p.originalName])).toEqual([[next.id, 'on', 'second-on.jpg']]);
    expect(await m.photos.getPhoto(labId, old.id)).toBeNull();
    expect(await m.storage.getStorage().get(old.storageKey)).toBeNull();
    expect(filesIn(join(tmp, 'storage')).length).toBe(before);
  });

  it('without `replaces` the same file joins the bracket instead (what Replace must not do)', async () => {
    const { small, other } = await scenes();
    const setId = await newSet('bracket');
    await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'a-on.jpg', bytes: small.on });
    await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'b-on.jpg', bytes: other.on });
    expect((await m.photos.listPhotos(labId, setId)).length).toBe(2);
  });

  it('checks the size without the photo it replaces, and against every other photo', async () => {
    const { small, large } = await scenes();
    const setId = await newSet('replace with another size');
    const { photo: old } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'small-on.jpg', bytes: small.on });
    // alone in the set: a larger photo may take its place
    const { photo: big } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'large-on.jpg', bytes: large.on, replaces: old.id });
    expect(big.width).toBe(480);
    // with an off photo of that size, a small one is refused and the large one stays
    await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'off', name: 'large-off.jpg', bytes: large.off });
    const files = filesIn(join(tmp, 'storage')).length;
    const r = await refusal(m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'small-again-on.jpg', bytes: small.ambient, replaces: big.id }));
    expect(r.message).toBe('small-again-on.jpg is 400 × 300 pixels but the off photo is 480 × 360: shoot every role with the same camera and settings, uncropped');
    expect((await m.photos.listPhotos(labId, setId)).map((p) => p.id)).toContain(big.id);
    expect(filesIn(join(tmp, 'storage')).length).toBe(files);
  });

  it('stores nothing when the photo to replace went in the meantime', async () => {
    const { small, other } = await scenes();
    const setId = await newSet('replace a removed photo');
    const { photo: old } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'off', name: 'gone-off.jpg', bytes: small.off });
    await m.photos.deletePhoto(labId, userId, old.id);
    const files = filesIn(join(tmp, 'storage')).length;
    const r = await refusal(m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'off', name: 'late-off.jpg', bytes: other.off, replaces: old.id }));
    expect(r).toMatchObject({ status: 409, code: 'gone' });
    expect(r.message).toMatch(/removed in the meantime: nothing was stored/);
    expect(await m.photos.listPhotos(labId, setId)).toEqual([]);
    expect(filesIn(join(tmp, 'storage')).length).toBe(files);
  });
});

describe('when the photos last changed', () => {
  const changedAt = async (setId: string) => m.changes.getPhotosChangedAt(labId, setId);

  it('moves on an upload, a replacement, a removal and an encoding change, and not on other edits', async () => {
    const { small, other } = await scenes();
    const setId = await newSet('changes');
    expect(await changedAt(setId)).toBeNull();
    const { photo: on } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'ch-on.jpg', bytes: small.on });
    const t1 = await changedAt(setId);
    expect(t1).toBeInstanceOf(Date);

    const { photo: off } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'off', name: 'ch-off.jpg', bytes: small.off });
    const t2 = (await changedAt(setId)) as Date;
    expect(t2.getTime()).toBeGreaterThan((t1 as Date).getTime());

    const { photo: on2 } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'ch-on-2.jpg', bytes: other.on, replaces: on.id });
    const t3 = (await changedAt(setId)) as Date;
    expect(t3.getTime()).toBeGreaterThan(t2.getTime());

    await m.photos.setPhotoEncoding(labId, userId, setId, off.id, 'srgb');
    const t4 = (await changedAt(setId)) as Date;
    expect(t4.getTime()).toBeGreaterThan(t3.getTime());

    // a name edit is not a change of what is measured
    await m.db.getDb()('photos').where({ id: on2.id }).update({ original_name: 'renamed.jpg' });
    expect(((await changedAt(setId)) as Date).getTime()).toBe(t4.getTime());

    await m.photos.deletePhoto(labId, userId, off.id);
    expect(((await changedAt(setId)) as Date).getTime()).toBeGreaterThan(t4.getTime());
  });

  it('says a reading is older than the photos when its analysis started before the change', async () => {
    const changed = new Date('2027-03-04T10:00:00Z');
    expect(m.changes.madeBeforePhotoChange(changed, { queuedAt: new Date('2027-03-04T09:00:00Z'), startedAt: new Date('2027-03-04T09:59:59Z') })).toBe(true);
    expect(m.changes.madeBeforePhotoChange(changed, { queuedAt: new Date('2027-03-04T09:00:00Z'), startedAt: new Date('2027-03-04T10:00:01Z') })).toBe(false);
    // queued before, not started yet: it will read the photos as they are when it starts, but may not have
    expect(m.changes.madeBeforePhotoChange(changed, { queuedAt: new Date('2027-03-04T09:00:00Z'), startedAt: null })).toBe(true);
    expect(m.changes.madeBeforePhotoChange(null, { queuedAt: new Date('2027-03-04T09:00:00Z'), startedAt: null })).toBe(false);
  });

  it('a capture set with photos can still be deleted, and its record goes with it', async () => {
    const { large } = await scenes();
    const setId = await newSet('deleted with photos');
    await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'del-on.jpg', bytes: large.on });
    await m.db.getDb()('capture_sets').where({ id: setId }).delete();
    expect(await m.db.getDb()('photos').where({ capture_set_id: setId }).first()).toBeUndefined();
    expect(await m.db.getDb()('photo_changes').where({ capture_set_id: setId }).first()).toBeUndefined();
  });

  it('answers another lab nothing', async () => {
    const { large } = await scenes();
    const setId = await newSet('scoped');
    await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'scoped-on.jpg', bytes: large.ambient });
    expect(await m.changes.getPhotosChangedAt('00000000-0000-4000-8000-000000000000', setId)).toBeNull();
  });
});

describe('thumbnails', () => {
  it('are small WebP images of the preview, upright and in proportion', async () => {
    const { other } = await scenes();
    const setId = await newSet('thumbs');
    const { photo } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'thumb-on.jpg', bytes: other.ambient });
    const preview = await m.storage.getStorage().get(photo.previewKey as string);
    const thumb = await m.thumb.makeThumbnail(preview as Uint8Array);
    const meta = await sharp(thumb).metadata();
    expect(meta.format).toBe('webp');
    expect([meta.width, meta.height]).toEqual([192, 144]);
    expect(thumb.byteLength).toBeLessThan(20_000);
  });
});
