// Hostile files through the upload intake and the engine: each is refused with a message that
// names the file and says what to send, nothing is stored, and memory stays bounded.
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { hostileCorpus, type HostileFile } from '../fixtures/hostile/corpus';
import { createTestLab } from '../fixtures/test-lab';

const tmp = mkdtempSync(join(tmpdir(), 'vm-hostile-'));
process.env.STORAGE_DIR = join(tmp, 'storage');

type Mods = {
  db: typeof import('../../db/index');
  ingest: typeof import('../../lib/server/storage/ingest-photo');
  photos: typeof import('../../db/queries/photos');
  errors: typeof import('../../lib/errors');
  image: typeof import('../../lib/image');
  engineErrors: typeof import('../../lib/photometry/errors');
};
let m: Mods;
let labId = '';
let userId = '';
let setId = '';
let capture: RenderedCapture;
let corpus: HostileFile[] = [];
let baseline = 0;
let peak = 0;
let sampler: NodeJS.Timeout | undefined;

function filesIn(dir: string): string[] {
  try {
    return readdirSync(dir).flatMap((n) => (statSync(join(dir, n)).isDirectory() ? filesIn(join(dir, n)) : [join(dir, n)]));
  } catch {
    return [];
  }
}

beforeAll(async () => {
  m = {
    db: await import('../../db/index'),
    ingest: await import('../../lib/server/storage/ingest-photo'),
    photos: await import('../../db/queries/photos'),
    errors: await import('../../lib/errors'),
    image: await import('../../lib/image'),
    engineErrors: await import('../../lib/photometry/errors'),
  };
  capture = await renderCapture({ width: 480, height: 360, seed: 31, ghost: null });
  const db = m.db.getDb();
  const tag = Math.random().toString(36).slice(2, 8);
  let revisionId: string;
  ({ labId, userId, revisionId } = await createTestLab(db, { tag: `hostile-${tag}`, name: 'Hostile Test', project: 'Hostile rig', revision: 'H1' }));
  const [set] = await db('capture_sets').insert({ lab_id: labId, revision_id: revisionId, label: 'hostile', pattern: capture.truth.pattern, created_by: userId }).returning<{ id: string }[]>('id');
  setId = (set as { id: string }).id;
  corpus = await hostileCorpus();
  global.gc?.();
  baseline = process.memoryUsage().rss;
  peak = baseline;
  sampler = setInterval(() => {
    peak = Math.max(peak, process.memoryUsage().rss);
  }, 10);
});

afterAll(async () => {
  if (sampler) clearInterval(sampler);
  if (labId) {
    const db = m.db.getDb();
    await db('labs').where({ id: labId }).delete();
    await db('users').where({ id: userId }).delete();
  }
  await m?.db.closeDb();
  rmSync(tmp, { recursive: true, force: true });
});

describe('hostile files', () => {
  it('are each refused by the upload intake with a clear message, leaving no row and no file', async () => {
    for (const f of corpus.filter((c) => c.name !== 'absurd-exif.jpg')) {
      const err = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'on', name: f.name, bytes: f.bytes }).then(
        () => null,
        (e: unknown) => e,
      );
      expect(err, `${f.what} was accepted`).toBeInstanceOf(m.errors.AppError);
      const e = err as InstanceType<typeof m.errors.AppError>;
      expect(e.status, f.what).toBeGreaterThanOrEqual(400);
      expect(e.status, f.what).toBeLessThan(500);
      expect(e.message, f.what).toMatch(f.expect);
      expect(e.message.startsWith(f.name), `${f.what}: ${e.message}`).toBe(true);
      expect(e.message, f.what).not.toMatch(/vips|sharp|Error:|\bat \//i);
    }
    expect(await m.photos.listPhotos(labId, setId)).toHaveLength(0);
    expect(filesIn(join(tmp, 'storage'))).toHaveLength(0);
  });

  it('keeps a photo with absurd EXIF but drops the values no camera produces', async () => {
    const f = corpus.find((c) => c.name === 'absurd-exif.jpg') as HostileFile;
    const { photo } = await m.ingest.ingestPhoto({ labId, userId, captureSetId: setId, role: 'ambient', name: f.name, bytes: f.bytes });
    expect(photo.exif.exposureTime).toBeUndefined();
    expect(photo.exif.fNumber).toBeUndefined();
    expect(photo.exif.takenAt).toBeUndefined();
    expect(photo.exif.orientation ?? 1).toBeLessThanOrEqual(8);
    expect((photo.exif.make ?? '').length).toBeLessThanOrEqual(80);
    expect(photo.exif.model ?? '').not.toMatch(/[\u0000-\u001f]/);
  });

  it('gives the engine none of the values no camera produces; the analysis runs and says exposure is unknown', async () => {
    const f = corpus.find((c) => c.name === 'absurd-exif.jpg') as HostileFile;
    const tags = await m.image.readExposureTags(f.bytes);
    expect(tags?.exposureTime).toBeUndefined();
    expect(tags?.fNumber).toBeUndefined();
    expect((tags?.make ?? '').length).toBeLessThanOrEqual(80);
    // the absurd photo against an ordinary one: equal exposure assumed, and said so
    const plain = await sharp(f.bytes).jpeg({ quality: 90 }).toBuffer();
    const { result } = await m.image.analyzeFiles({ on: { name: 'on.jpg', bytes: f.bytes }, off: { name: 'off.jpg', bytes: plain }, screen: { x: 100, y: 80, w: 120, h: 80 }, ghostOffset: 'none', artifacts: false });
    expect(result.warnings.map((w) => w.code)).toContain('exposure-unknown');
    expect(Number.isFinite(result.ambientContrastRatio ?? 1)).toBe(true);
  });

  it('are each refused by the engine with its input error, not a crash', async () => {
    const off = { name: 'off.jpg', bytes: capture.off };
    const ambient = { name: 'ambient.jpg', bytes: capture.ambient };
    for (const f of corpus.filter((c) => c.name !== 'absurd-exif.jpg')) {
      const err = await m.image
        .analyzeFiles({ on: { name: f.name, bytes: f.bytes }, off, ambient, pattern: capture.truth.pattern, screen: capture.truth.screen, background: capture.truth.background, artifacts: false })
        .then(
          () => null,
          (e: unknown) => e,
        );
      expect(m.engineErrors.isEngineInputError(err), `${f.what}: ${String(err)}`).toBe(true);
      const msg = (err as Error).message;
      expect(msg, f.what).toContain(f.name);
      expect(msg, f.what).toMatch(/send|upload|downscale|pick/);
    }
  });

  it('measures a photo whose EXIF is absurd without trusting it into a crash', async () => {
    const on = await sharp(capture.on)
      .withExif({ IFD0: { Make: 'M'.repeat(4000), Orientation: '99' }, IFD2: { ExposureTime: '1000000000/1', FNumber: '0/0', ISOSpeedRatings: '4294967295' } })
      .jpeg({ quality: 95 })
      .toBuffer();
    const { result } = await m.image.analyzeFiles({ on: { name: 'on.jpg', bytes: on }, off: { name: 'off.jpg', bytes: capture.off }, ambient: { name: 'ambient.jpg', bytes: capture.ambient }, pattern: capture.truth.pattern, screen: capture.truth.screen, background: capture.truth.background, artifacts: false });
    expect(Number.isFinite(result.ambientContrastRatio ?? NaN)).toBe(true);
  });

  it('keep memory bounded while the whole corpus went through', () => {
    // a 4225-megapixel header decoded for real would need gigabytes
    expect((peak - baseline) / 1e6).toBeLessThan(400);
  });
});
