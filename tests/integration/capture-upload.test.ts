// Upload intake against real PostgreSQL and a real storage folder: every refusal has its own
// message and leaves no row and no file behind.
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { declaredPng } from '../fixtures/hostile/corpus';
import { createTestLab } from '../fixtures/test-lab';

const tmp = mkdtempSync(join(tmpdir(), 'vm-upload-'));
process.env.STORAGE_DIR = join(tmp, 'storage');

type Mods = { db: typeof import('../../db/index'); ingest: typeof import('../../lib/server/storage/ingest-photo'); photos: typeof import('../../db/queries/photos'); errors: typeof import('../../lib/errors') };
let m: Mods;
let labId = '';
let userId = '';
let setId = '';
let capture: RenderedCapture;

function filesIn(dir: string): string[] {
  try {
    return readdirSync(dir).flatMap((n) => (statSync(join(dir, n)).isDirectory() ? filesIn(join(dir, n)) : [join(dir, n)]));
  } catch {
    return [];
  }
}

async function refusal(name: string, bytes: Uint8Array, role: 'on' | 'off' | 'ambient' | 'dark' = 'on'): Promise<{ status: number; message: string }> {
  try {
    await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role, name, bytes });
  } catch (e) {
    if (e instanceof m.errors.AppError) return { status: e.status, message: e.message };
    throw e;
  }
  throw new Error(`${name} was accepted`);
}

async function rowCount(): Promise<number> {
  const r = await m.db.getDb()('photos').where({ lab_id: labId }).count<{ count: string }[]>('* as count').first();
  return Number(r?.count ?? 0);
}

beforeAll(async () => {
  m = { db: await import('../../db/index'), ingest: await import('../../lib/server/storage/ingest-photo'), photos: await import('../../db/queries/photos'), errors: await import('../../lib/errors') };
  const db = m.db.getDb();
  const tag = Math.random().toString(36).slice(2, 8);
  let revisionId: string;
  ({ labId, userId, revisionId } = await createTestLab(db, { tag: `upload-${tag}`, name: 'Upload Test', project: 'Uploads', revision: 'U1' }));
  setId = ((await db('capture_sets').insert({ lab_id: labId, revision_id: revisionId, label: 'intake' }).returning<{ id: string }[]>('id'))[0] as { id: string }).id;
  capture = await renderCapture({ width: 400, height: 300, seed: 31 });
});

afterAll(async () => {
  if (labId) {
    await m.db.getDb()('labs').where({ id: labId }).delete();
    await m.db.getDb()('users').where({ id: userId }).delete();
  }
  await m?.db.closeDb();
  rmSync(tmp, { recursive: true, force: true });
});

describe('photo upload intake', () => {
  it('refuses each bad file with its own message and leaves nothing behind', async () => {
    const cases: [string, Uint8Array, RegExp][] = [
      ['notes.jpg', Buffer.from('Bench notes: splitter 40/60, polarizer at 12 degrees.\n'.repeat(20)), /notes\.jpg is not an image/],
      ['cut.jpg', capture.on.subarray(0, Math.floor(capture.on.length / 2)), /cut\.jpg is damaged or cut short/],
      ['empty.jpg', new Uint8Array(0), /empty\.jpg is empty/],
      ['huge.png', declaredPng(20000, 20000), /huge\.png has 400 megapixels .* more than 100/],
      ['phone.heic', Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic'), Buffer.alloc(40)]), /HEIC is not supported: export the photo as 16-bit TIFF or JPEG/],
      ['shot.cr2', Buffer.concat([Buffer.from([0x49, 0x49, 0x2a, 0]), Buffer.from([8, 0, 0, 0]), Buffer.from('CR'), Buffer.alloc(40)]), /shot\.cr2 has the signature of a Canon CR2 file, but .*: upload the original file from the camera again, or convert it to DNG/],
    ];
    for (const [name, bytes, re] of cases) {
      const r = await refusal(name, bytes);
      expect(r.message, name).toMatch(re);
      expect(r.status, name).toBeGreaterThanOrEqual(400);
      expect(r.message, name).not.toMatch(/\n\s+at /);
    }
    expect(await rowCount()).toBe(0);
    expect(filesIn(join(tmp, 'storage'))).toEqual([]);
  });

  it('stores a good photo once, with a preview and EXIF, and refuses a photo of another size or a duplicate', async () => {
    const { photo, duplicate } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'on.jpg', bytes: capture.on });
    expect(duplicate).toBe(false);
    expect(photo).toMatchObject({ role: 'on', width: 400, height: 300, format: 'jpeg', bitDepth: 8 });
    expect(photo.exif).toMatchObject({ exposureTime: 0.01, fNumber: 8, iso: 100 });
    expect(photo.storageKey).not.toContain('on.jpg');
    expect(filesIn(join(tmp, 'storage'))).toHaveLength(2);

    const again = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: 'on-copy.jpg', bytes: capture.on });
    expect(again.duplicate).toBe(true);
    expect((await refusal('on-as-off.jpg', capture.on, 'off')).message).toMatch(/already uploaded as the display on photo/);

    const other = await renderCapture({ width: 320, height: 240, seed: 32 });
    const r = await refusal('small-off.jpg', other.off, 'off');
    expect(r.message).toMatch(/small-off\.jpg is 320 × 240 pixels but the on photo is 400 × 300/);
    expect(await rowCount()).toBe(1);
    expect(filesIn(join(tmp, 'storage'))).toHaveLength(2);
  });
});
