import { PDFParse } from 'pdf-parse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { createUserWithLab } from '../../db/queries/users';
import { DEMO_LAB } from '../../db/seeds/demo-data';
import { PDF_FONT } from '../../lib/reports/pdf';
import { revisionReport } from '../../lib/server/reports/build';
import { captureReport } from '../../lib/server/reports/capture';

// The seeded demo lab (npm test and the dev stack seed it): VX-B has ten analysed capture sets,
// each with an on photo, its regions and both maps in storage.
let demo: { labId: string; revisionId: string; captureSetId: string; captureLabel: string };
let other: { userId: string; labId: string };
const tag = `${process.pid}-${Date.now()}`;

async function parse(bytes: Buffer): Promise<{ pages: string[] }> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  const r = await parser.getText();
  await parser.destroy();
  return { pages: r.pages.map((p) => p.text) };
}

const images = (bytes: Buffer) => bytes.toString('latin1').match(/\/Subtype \/Image/g)?.length ?? 0;

beforeAll(async () => {
  const db = getDb();
  const lab = await db('labs').where({ name: DEMO_LAB }).first();
  const rev = await db('revisions').where({ lab_id: lab.id, label: 'VX-B' }).first();
  const set = await db('capture_sets').where({ lab_id: lab.id, revision_id: rev.id }).orderBy('created_at').first();
  demo = { labId: lab.id, revisionId: rev.id, captureSetId: set.id, captureLabel: set.label };
  other = await createUserWithLab({ email: `pics-${tag}@example.test`, name: 'Pictures B', passwordHash: 'x', labName: `Pictures B ${tag}` });
});

afterAll(async () => {
  const db = getDb();
  await db('labs').where({ id: other.labId }).del();
  await db('users').where({ id: other.userId }).del();
  await closeDb();
});

describe('the demo revision report', () => {
  let bytes: Buffer;
  let pages: string[];
  beforeAll(async () => {
    bytes = (await revisionReport(demo.labId, demo.revisionId, { labName: DEMO_LAB })).bytes;
    pages = (await parse(bytes)).pages;
  }, 120_000);

  it('is set in the bundled font, with ΔE00 as it is', () => {
    expect(bytes.toString('latin1')).toMatch(new RegExp(`/BaseFont /[A-Z]{6}\\+${PDF_FONT.postscriptName}`));
    const text = pages.join('\n');
    expect(text).toContain('ΔE00');
    expect(text).not.toMatch(/\bdE00\b/);
  });

  it('shows each capture set’s photo with its regions beside its contrast map, as palette images', () => {
    const text = pages.join('\n').replace(/\s+/g, ' ');
    expect(text).toContain('Photos and contrast maps');
    expect(text).toContain(`${demo.captureLabel} · on photo with the regions measured`);
    expect(text).toMatch(/Local contrast log10\(on\/off\)/);
    // ten analysed sets: a photo and a map each
    expect(images(bytes)).toBe(20);
    expect(bytes.toString('latin1')).toContain('/Indexed');
  });

  it('stays under 800 kB with its twenty pictures', () => {
    expect(bytes.length).toBeLessThan(800_000);
  });

  it('ends on a page with more than a footer on it', () => {
    const last = pages[pages.length - 1]!.replace(/Veilmeter · .* · page \d+ of \d+/, '').trim();
    // the closing cautions are about 600 characters; a near-blank page would hold a line or two
    expect(last.length).toBeGreaterThan(400);
    for (const p of pages) expect(p.replace(/Veilmeter · .* · page \d+ of \d+/, '').trim().length).toBeGreaterThan(100);
  });
});

describe('the capture set report', () => {
  it('has the reading, the on photo with the regions named, and both maps, under 300 kB', async () => {
    const { bytes, name } = await captureReport(demo.labId, demo.captureSetId, { labName: DEMO_LAB });
    expect(name).toContain(demo.captureLabel);
    const text = (await parse(bytes)).pages.join('\n').replace(/\s+/g, ' ');
    expect(text).toContain(demo.captureLabel);
    expect(text).toMatch(/Ambient contrast ratio \d/);
    for (const region of ['screen', 'background']) expect(text).toContain(region);
    expect(text).toMatch(/Local contrast log10\(on\/off\)/);
    expect(text).toMatch(/Display light D = on − off/);
    expect(images(bytes)).toBe(3);
    expect(bytes.length).toBeLessThan(300_000);
  }, 120_000);

  it('is a 404 for another lab', async () => {
    await expect(captureReport(other.labId, demo.captureSetId, { labName: 'B' })).rejects.toMatchObject({ status: 404 });
  });
});
