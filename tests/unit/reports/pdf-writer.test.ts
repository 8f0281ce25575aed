import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { PDFParse } from 'pdf-parse';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { reportFigure } from '../../../lib/image/report-figure';
import { MISSING_GLYPH, PDF_FONT, pdfText, ReportWriter } from '../../../lib/reports/pdf';

async function parse(bytes: Buffer): Promise<{ pages: string[]; total: number }> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  const r = await parser.getText();
  await parser.destroy();
  return { pages: r.pages.map((p) => p.text), total: r.total };
}

describe('the report font', () => {
  it('is the bundled DejaVu Sans of @fontsource/dejavu-sans, not a font of the system', () => {
    expect(PDF_FONT.dir).toBe(join(process.cwd(), 'node_modules', '@fontsource', 'dejavu-sans', 'files'));
    expect(existsSync(join(PDF_FONT.dir, PDF_FONT.regular))).toBe(true);
    expect(existsSync(join(PDF_FONT.dir, PDF_FONT.bold))).toBe(true);
  });

  it('is embedded, and ΔE00, ≥, ± and accented names round-trip through text extraction', async () => {
    const w = new ReportWriter('Zoë Łukasiewicz — ΔE00', { compress: false });
    w.title('Kestrel Row · revision report', 'Visor VX · VX-B', 'Ingrid Søndergård, Zoë Łukasiewicz, Dvořák');
    w.paragraph('See-through tint (ΔE00) 1.8 · contrast ≥ 3 : 1 · ghost 0.24 % ± 0.03 % · ≈ 730 cd/m²');
    const bytes = await w.finish('Veilmeter · test');
    const raw = bytes.toString('latin1');
    // the subset pdfkit embeds is named after the font's PostScript name, with a six-letter tag
    expect(raw).toMatch(new RegExp(`/BaseFont /[A-Z]{6}\\+${PDF_FONT.postscriptName}`));
    expect(raw).toContain('/FontFile2');
    expect(raw).toContain('/ToUnicode');
    expect(raw).not.toContain('/Helvetica');
    const text = (await parse(bytes)).pages.join('\n');
    expect(text).toContain('See-through tint (ΔE00)');
    expect(text).not.toContain('dE00');
    expect(text).toContain('≥ 3 : 1');
    expect(text).toContain('± 0.03 %');
    expect(text).toContain('Zoë Łukasiewicz');
    expect(text).toContain('Søndergård');
    expect(text).toContain('Dvořák');
  });

  it('prints a character the font lacks (CJK) as the replacement character, never as an empty glyph', async () => {
    expect(pdfText('李 Wei', (cp) => cp < 128)).toBe(`${MISSING_GLYPH} Wei`);
    const w = new ReportWriter('CJK');
    w.paragraph('Operator 李伟 (Li Wei)');
    const text = (await parse(await w.finish('f'))).pages.join('\n');
    expect(text).toContain(`Operator ${MISSING_GLYPH}${MISSING_GLYPH} (Li Wei)`);
    expect(text).not.toContain('\u0000');
  });
});

describe('tables and charts', () => {
  it('widen a narrow column so its heading does not break in the middle of a word', async () => {
    const w = new ReportWriter('t');
    w.table(
      [
        { header: 'Capture set', width: 6 },
        { header: 'Transmission', width: 0.5, align: 'right' },
        { header: 'Uniformity', width: 0.5, align: 'right' },
      ],
      [{ cells: ['VX-B with polarizer #1', '75.9 %', '0.82'] }],
    );
    const text = (await parse(await w.finish('f'))).pages.join('\n');
    expect(text).toMatch(/\bTransmission\b/);
    expect(text).toMatch(/\bUniformity\b/);
  });

  it('never draw a negative axis for a ratio, even when a small group’s CI reaches below zero', async () => {
    const w = new ReportWriter('c');
    w.chart({
      title: 'Ghost ratio',
      unit: '%',
      tick: (v) => `T${v}`,
      groups: [
        { label: 'A', mean: 0.4, low: -0.6, high: 1.4, points: [0.1, 0.5, 0.6] },
        { label: 'B', mean: 2.1, low: 1.9, high: 2.3, points: [2, 2.1, 2.2] },
      ],
      targets: [],
    });
    const text = (await parse(await w.finish('f'))).pages.join('\n');
    const ticks = [...text.matchAll(/T(-?[\d.]+)/g)].map((m) => Number(m[1]));
    expect(ticks.length).toBeGreaterThanOrEqual(3);
    expect(Math.min(...ticks)).toBe(0);
    expect(ticks.every((t) => t >= 0)).toBe(true);
  });

  it('keep a long group label whole: the label shrinks to fit its column', async () => {
    const w = new ReportWriter('c');
    const groups = Array.from({ length: 10 }, (_, i) => ({ label: `R${i} · antireflective`, mean: 2, low: 1.8, high: 2.2, points: [2] }));
    w.chart({ title: 'Ambient contrast ratio', unit: 'x : 1', groups, targets: [] });
    const text = (await parse(await w.finish('f'))).pages.join('\n');
    expect(text.match(/antireflective/g)?.length).toBe(10);
  });
});

describe('the end of a report', () => {
  const cautions = Array.from({ length: 6 }, (_, i) => `Caution ${i + 1}: readings are engineering estimates from consumer cameras, not certification; keep the camera, exposure and room the same between captures.`);

  it('sets the closing section smaller rather than leave it a page of its own when it nearly fits', async () => {
    const w = new ReportWriter('end');
    // fill the page until the closing section fits only in the smaller size
    while (w.remaining() > 175) w.paragraph('Filler line of a report that is long enough to wrap once across the page width, so the page fills quickly.');
    w.closingSection('Cautions', cautions);
    const fill = w.pageFill();
    const { total } = await parse(await w.finish('f'));
    expect(total).toBe(1);
    expect(fill).toBeLessThanOrEqual(1);
  });

  it('moves it whole to a new page when it cannot fit, never splitting off one bullet', async () => {
    const w = new ReportWriter('end');
    while (w.remaining() > 60) w.paragraph('Filler line of a report that is long enough to wrap once across the page width, so the page fills quickly.');
    w.closingSection('Cautions', cautions);
    const { pages, total } = await parse(await w.finish('f'));
    expect(total).toBe(2);
    expect(pages[1]).toContain('Cautions');
    for (let i = 1; i <= 6; i++) expect(pages[1]).toContain(`Caution ${i}:`);
  });
});

describe('pictures', () => {
  it('embeds a quantised palette PNG with its regions named on it, and stays small', async () => {
    // a 1200 × 800 photo of a lit screen in a room: a vignetted gradient, coloured patches, sensor noise
    const raw = Buffer.alloc(1200 * 800 * 3);
    let seed = 7;
    for (let y = 0; y < 800; y++) {
      for (let x = 0; x < 1200; x++) {
        const i = (y * 1200 + x) * 3;
        const screen = x > 360 && x < 840 && y > 240 && y < 520;
        const vignette = 1 - ((x - 600) ** 2 + (y - 400) ** 2) / 900_000;
        for (let c = 0; c < 3; c++) {
          seed = (seed * 1103515245 + 12345) & 0x7fffffff;
          const patch = ((Math.floor(x / 97) * 31 + Math.floor(y / 83) * 17 + c * 40) % 90) - 45;
          raw[i + c] = Math.max(0, Math.min(255, Math.round((screen ? 200 : 90 + patch) * vignette + ((seed >> 16) % 7) - 3)));
        }
      }
    }
    const jpeg = await sharp(raw, { raw: { width: 1200, height: 800, channels: 3 } }).jpeg({ quality: 90 }).toBuffer();
    const fig = await reportFigure(jpeg, 'photo');
    expect(Math.max(fig.width, fig.height)).toBeLessThanOrEqual(640);
    const meta = await sharp(fig.png).metadata();
    expect(meta.format).toBe('png');
    expect(meta.isPalette).toBe(true);
    // the palette image-q chose is what the PNG holds (no second quantisation), and it keeps the picture:
    // mean error against the same resize without a palette within 4 of 255 levels per channel
    const decoded = await sharp(fig.png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    const unique = new Set<number>();
    for (let i = 0; i < decoded.data.length; i += 3) unique.add((decoded.data[i]! << 16) | (decoded.data[i + 1]! << 8) | decoded.data[i + 2]!);
    expect(unique.size).toBeLessThanOrEqual(fig.colours);
    expect(fig.colours).toBeLessThanOrEqual(48);
    const plain = await sharp(jpeg).resize({ width: 640, height: 640, fit: 'inside' }).removeAlpha().raw().toBuffer();
    let err = 0;
    for (let i = 0; i < plain.length; i++) err += Math.abs(plain[i]! - decoded.data[i]!);
    expect(err / plain.length).toBeLessThan(4);
    const w = new ReportWriter('pictures', { compress: true });
    w.figures([
      { ...fig, caption: 'On photo', regions: [{ kind: 'screen', x: 0.3, y: 0.3, w: 0.4, h: 0.3 }, { kind: 'background', x: 0.05, y: 0.05, w: 0.2, h: 0.15 }, { kind: 'ghost', x: 0.32, y: 0.28, w: 0.4, h: 0.3 }] },
      { ...fig, caption: 'Map' },
    ]);
    const bytes = await w.finish('f');
    expect(bytes.toString('latin1')).toContain('/Indexed');
    const text = (await parse(bytes)).pages.join('\n');
    for (const name of ['screen', 'background', 'ghost']) expect(text).toContain(name);
    // bound of this test: a picture under 150 kB even with sensor noise left in, two and the page under 300 kB
    expect(fig.png.length).toBeLessThan(150_000);
    expect(bytes.length).toBeLessThan(300_000);
  });
});
