import { inflateSync } from 'node:zlib';
import { PDFParse } from 'pdf-parse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { listExportRows } from '../../db/queries/exports';
import { createTarget } from '../../db/queries/targets';
import { createUserWithLab } from '../../db/queries/users';
import { comparisonReport, loadComparison, projectReport, revisionReport } from '../../lib/server/reports/build';
import { formatChange } from '../../lib/targets/compare';
import { CSV_HEADERS, readingsCsv } from '../../lib/server/reports/csv';
import { insertFixtureProject, insertReading, type Fixture, removeTestLabs } from '../fixtures/readings-fixture';

// Invented readings in real PostgreSQL; the exports must give back exactly what is stored.
const tag = `${process.pid}-${Date.now()}`;
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
let fx: Fixture;

/** RFC 4180 parser: quoted fields, doubled quotes, CRLF. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  const s = text.replace(/^\uFEFF/, '');
  for (let i = 0; i < s.length; i++) {
    const c = s[i];
    if (quoted) {
      if (c === '"' && s[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') {
      row.push(field);
      field = '';
    } else if (c === '\r' && s[i + 1] === '\n') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
      i++;
    } else field += c;
  }
  if (field || row.length) rows.push([...row, field]);
  return rows;
}

async function pdfText(bytes: Buffer): Promise<{ pages: number; text: string }> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  const r = await parser.getText();
  await parser.destroy();
  return { pages: r.total, text: r.text };
}

beforeAll(async () => {
  a = await createUserWithLab({ email: `xa-${tag}@example.test`, name: 'Export A', passwordHash: 'x', labName: `Exports A ${tag}` });
  b = await createUserWithLab({ email: `xb-${tag}@example.test`, name: 'Export B', passwordHash: 'x', labName: `Exports B ${tag}` });
  fx = await insertFixtureProject(a.labId, `Export visor, "quoted" ${tag}`, [
    { label: 'X-1', variants: [{ variant: 'plain, bare', readings: [{ acr: 1.2345678901234567, ghost: 0.0123, transmission: 0.31 }, { acr: 1.31, ghost: 0.011 }, { acr: 1.27, uniformity: 0.8 }] }] },
    {
      label: 'X-2',
      variants: [
        { variant: 'no polarizer', readings: [{ acr: 1.41 }, { acr: 1.44 }, { acr: 1.39 }] },
        { variant: 'with polarizer', readings: [{ acr: 1.62 }, { acr: 1.66 }, { acr: 1.6 }, { acr: 1.64 }] },
      ],
    },
  ]);
  // an older re-run must not show up: the export carries the newest reading of each set
  await insertReading(a.labId, fx.projectId, fx.revisions['X-1']!.id, fx.revisions['X-1']!.captureSetIds[0]!, { acr: 9.99 }, new Date(Date.now() - 86_400_000));
  await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ambientContrastRatio', comparator: '>=', value: 1.35, conditionNote: 'office window light', isDefault: false });
});

afterAll(async () => {
  await removeTestLabs([a.labId, b.labId], [a.userId, b.userId], fx.projectId);
  await closeDb();
});

describe('readings CSV', () => {
  it('parses back to exactly the stored numbers, with units in the headers', async () => {
    const rows = await listExportRows(a.labId, { projectId: fx.projectId });
    const csv = parseCsv(readingsCsv(rows));
    expect(csv[0]).toEqual(CSV_HEADERS);
    expect(csv[0]).toContain('ambient_contrast_ratio (ratio L_on/L_off)');
    expect(csv[0]).toContain('background_luminance (cd/m²)');
    const col = (name: string) => CSV_HEADERS.findIndex((h) => h.startsWith(name));
    const body = csv.slice(1);
    const stored = await getDb()('readings as g')
      .join('capture_sets as c', 'c.id', 'g.capture_set_id')
      .where('g.project_id', fx.projectId)
      .select('g.id', 'g.ambient_contrast_ratio', 'g.ghost_ratio', 'g.transmission', 'g.uniformity', 'g.michelson', 'c.label', 'c.variant');
    expect(body).toHaveLength(10);
    for (const line of body) {
      const s = stored.find((r) => r.id === line[col('reading_id')]);
      expect(s, `reading ${line[col('reading_id')]}`).toBeDefined();
      expect(Number(line[col('ambient_contrast_ratio')])).toBe(s.ambient_contrast_ratio);
      expect(Number(line[col('michelson')])).toBe(s.michelson);
      expect(line[col('ghost_ratio')] === '' ? null : Number(line[col('ghost_ratio')])).toBe(s.ghost_ratio);
      expect(line[col('transmission')] === '' ? null : Number(line[col('transmission')])).toBe(s.transmission);
      expect(line[col('uniformity')] === '' ? null : Number(line[col('uniformity')])).toBe(s.uniformity);
      expect(line[col('variant')]).toBe(s.variant);
      expect(line[col('capture_set')]).toBe(s.label);
    }
    expect(body.map((l) => Number(l[col('ambient_contrast_ratio')]))).toContain(1.2345678901234567);
    expect(body.map((l) => Number(l[col('ambient_contrast_ratio')]))).not.toContain(9.99);
    expect(body[0]?.[col('project')]).toBe(`Export visor, "quoted" ${tag}`);
  });

  it('shows nothing of another lab', async () => {
    expect(await listExportRows(b.labId, { projectId: fx.projectId })).toEqual([]);
    expect(await listExportRows(b.labId, { projectId: fx.projectId, revisionId: fx.revisions['X-1']!.id })).toEqual([]);
  });
});

describe('PDF reports', () => {
  it('of a revision: at least one page, its label and the target status in the text (compressed streams)', async () => {
    const { bytes } = await revisionReport(a.labId, fx.revisions['X-1']!.id, { labName: 'Exports A' });
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
    // compressed by default: the page streams are Flate
    expect(bytes.includes(Buffer.from('/FlateDecode'))).toBe(true);
    const { pages, text } = await pdfText(bytes);
    expect(pages).toBeGreaterThanOrEqual(1);
    expect(text).toContain('X-1');
    // lines wrap inside table cells: compare with the whitespace folded
    expect(text.replace(/\s+/g, ' ')).toMatch(/Ambient contrast ratio at least 1\.35 : 1/);
    expect(text).toContain('FAIL');
    expect(text).toMatch(/engineering estimates, not certification/);
  });

  it('of a revision that meets its target says PASS; the streams inflate with zlib too', async () => {
    const { bytes } = await revisionReport(a.labId, fx.revisions['X-2']!.id, { labName: 'Exports A' });
    const { text } = await pdfText(bytes);
    expect(text).toContain('X-2');
    expect(text).toContain('PASS');
    // read the first content stream by hand: pdfkit writes "stream\n…\nendstream"
    const raw = bytes.toString('latin1');
    const start = raw.indexOf('stream\n') + 'stream\n'.length;
    const end = raw.indexOf('\nendstream', start);
    expect(inflateSync(Buffer.from(raw.slice(start, end), 'latin1')).length).toBeGreaterThan(0);
  });

  it('of a comparison and of the project carry the verdict and the revisions', async () => {
    const x2 = fx.revisions['X-2']!.id;
    const cmp = await comparisonReport(a.labId, fx.projectId, { revisionId: x2, variant: 'no polarizer' }, { revisionId: x2, variant: 'with polarizer' }, { labName: 'Exports A' });
    const c = await pdfText(cmp.bytes);
    const flat = c.text.replace(/\s+/g, ' ');
    expect(flat).toMatch(/X-2 · with polarizer \(against X-2 · no polarizer\) raises the ambient contrast ratio/);
    expect(flat).toMatch(/Gains: raises the ambient contrast ratio by/);
    // the change column: B's mean against A's from the same groups the page compares
    const { metrics } = await loadComparison(a.labId, fx.projectId, { revisionId: x2, variant: 'no polarizer' }, { revisionId: x2, variant: 'with polarizer' });
    const acr = metrics.find((m) => m.metric === 'ambientContrastRatio');
    const change = formatChange(acr as NonNullable<typeof acr>);
    expect(change).toMatch(/^\+\d/);
    expect(flat).toContain(change);
    const p = await pdfText((await projectReport(a.labId, fx.projectId, { labName: 'Exports A' })).bytes);
    expect(p.text).toContain('X-1');
    expect(p.text).toContain('X-2');
  });

  it('refuse another lab’s revision with a 404', async () => {
    await expect(revisionReport(b.labId, fx.revisions['X-1']!.id, { labName: 'B' })).rejects.toMatchObject({ status: 404 });
    await expect(projectReport(b.labId, fx.projectId, { labName: 'B' })).rejects.toMatchObject({ status: 404 });
  });
});
