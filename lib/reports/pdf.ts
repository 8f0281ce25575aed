import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { create as openFont } from 'fontkit';
import PDFDocument from 'pdfkit';
import { formatSig } from '../format';

/** One column of a PDF table: share of the width and alignment. */
export type PdfColumn = { header: string; width: number; align?: 'left' | 'right' };

export type ChartGroup = { label: string; mean: number | null; low: number | null; high: number | null; points: number[]; highlight?: boolean };
export type ChartSpec = {
  title: string;
  unit: string;
  groups: ChartGroup[];
  targets: { value: number; label: string; failing?: boolean }[];
  tick?: (v: number) => string;
  /** The smallest value the quantity can take (0 unless said): the axis never reaches below it. */
  floor?: number | null;
};

/**
 * The reports' font ships with the app: DejaVu Sans from @fontsource/dejavu-sans (SIL OFL 1.1), one
 * file per weight that covers Latin, Latin Extended, Greek, Cyrillic and the symbols the reports
 * print (Δ ≥ ≤ ± − ≈ × √ → ·). pdfkit embeds the glyphs a report uses, not the whole file. It is
 * read from the app's own node_modules (Next serves the app from its folder).
 */
export const PDF_FONT = {
  family: 'DejaVu Sans',
  postscriptName: 'DejaVuSans',
  dir: join(process.cwd(), 'node_modules', '@fontsource', 'dejavu-sans', 'files'),
  regular: 'dejavu-sans-latin-400-normal.woff',
  bold: 'dejavu-sans-latin-700-normal.woff',
};

/**
 * What a glyph the font lacks prints as: CJK and other scripts outside the font are not bundled
 * (a CJK font is tens of megabytes), so each such character shows as the replacement character.
 */
export const MISSING_GLYPH = '\uFFFD';

type ReportFonts = { regular: Buffer; bold: Buffer; has: (codePoint: number) => boolean };
let loaded: ReportFonts | null | undefined;

/** The bundled font's bytes and its coverage, read once per process; null when the files are missing. */
export function reportFonts(): ReportFonts | null {
  if (loaded !== undefined) return loaded;
  try {
    const regular = readFileSync(join(PDF_FONT.dir, PDF_FONT.regular));
    const bold = readFileSync(join(PDF_FONT.dir, PDF_FONT.bold));
    const r = openFont(regular);
    const b = openFont(bold);
    const cache = new Map<number, boolean>();
    const has = (cp: number) => {
      let v = cache.get(cp);
      if (v === undefined) {
        v = r.hasGlyphForCodePoint(cp) && b.hasGlyphForCodePoint(cp);
        cache.set(cp, v);
      }
      return v;
    };
    loaded = { regular, bold, has };
  } catch (e) {
    // a broken install: the reports still come out, in Helvetica with symbols spelled out
    console.error('PDF font not found, falling back to Helvetica:', (e as Error).message);
    loaded = null;
  }
  return loaded;
}

/** A region drawn on a report picture, as fractions of the picture's width and height. */
export type FigureRegion = { kind: 'screen' | 'background' | 'ghost'; x: number; y: number; w: number; h: number };
/** A picture for `figures`: palette PNG bytes (lib/image/report-figure.ts), its size in px, a caption. */
export type PdfFigure = { png: Buffer; width: number; height: number; caption: string; regions?: FigureRegion[] };

// The region editor's colours and strokes (components/capture/region-editor-model.ts): Okabe–Ito
// hues (common practice for palettes read alike with the common colour-vision deficiencies), each
// with a stroke pattern and a name on the outline, so no region is told by colour alone
export const REGION_STYLE: Record<FigureRegion['kind'], { colour: string; label: string; pattern: 'solid' | 'dashed' | 'dotted' }> = {
  screen: { colour: '#56B4E9', label: 'screen', pattern: 'solid' },
  background: { colour: '#F0E442', label: 'background', pattern: 'dashed' },
  ghost: { colour: '#D55E00', label: 'ghost', pattern: 'dotted' },
};

const INK = '#18202c';
const MUTED = '#5c687a';
const LINE = '#c9d1dc';
const BEAM = '#0d8076';
const GLOW = '#b06a00';
const FAIL = '#c02c2c';
const PASS = '#1e8449';

// The built-in Helvetica speaks WinAnsi only: symbols outside it become plain-text equivalents.
const REPLACE: Record<string, string> = { '≥': '>=', '≤': '<=', 'Δ': 'Delta ', '−': '-', '≈': '~', '×': 'x', '√': 'sqrt', '…': '...', '→': '->', '·': '·', '²': '²', '±': '±' };

/**
 * Text the font can set. With the bundled font (`unicode` true, or its coverage test) the text stays
 * as it is, except characters the font lacks, which print as MISSING_GLYPH; with the built-in
 * Helvetica (WinAnsi only) known symbols are spelled out and anything else outside Latin-1 is '?'.
 */
export function pdfText(s: string, unicode: boolean | ((codePoint: number) => boolean) = false): string {
  if (unicode === true) return s;
  if (typeof unicode === 'function') {
    let out = '';
    for (const ch of s) {
      const cp = ch.codePointAt(0)!;
      out += cp < 0x20 || unicode(cp) ? ch : MISSING_GLYPH;
    }
    return out;
  }
  let out = '';
  for (const ch of s) {
    const r = REPLACE[ch];
    if (r !== undefined) out += r;
    else if (/[\u0020-\u007e\u00a0-\u00ff\u2013\u2014\u2018\u2019\u201c\u201d\u2022]/.test(ch)) out += ch;
    else if (ch === '\n') out += ch;
    else out += '?';
  }
  return out;
}

/** A small report writer over pdfkit: headings, paragraphs, tables and an interval chart. */
export class ReportWriter {
  readonly doc: PDFKit.PDFDocument;
  private readonly chunks: Buffer[] = [];
  private readonly done: Promise<Buffer>;
  private readonly fr: string;
  private readonly fb: string;
  private readonly unicode: ((codePoint: number) => boolean) | false;

  constructor(title: string, opts: { compress?: boolean } = {}) {
    const fonts = reportFonts();
    // the document information is a PDF text string (UTF-16 when it needs to be), any script
    this.doc = new PDFDocument({ size: 'A4', margin: 48, bufferPages: true, compress: opts.compress ?? true, info: { Title: title, Author: 'Veilmeter', Creator: 'Veilmeter' } });
    this.unicode = fonts ? fonts.has : false;
    if (fonts) {
      this.doc.registerFont('Body', fonts.regular);
      this.doc.registerFont('Body-Bold', fonts.bold);
    }
    this.fr = fonts ? 'Body' : 'Helvetica';
    this.fb = fonts ? 'Body-Bold' : 'Helvetica-Bold';
    this.doc.on('data', (c: Buffer) => this.chunks.push(c));
    this.done = new Promise((resolve, reject) => {
      this.doc.on('end', () => resolve(Buffer.concat(this.chunks)));
      this.doc.on('error', reject);
    });
  }

  private t(s: string): string {
    return pdfText(s, this.unicode);
  }

  private get width(): number {
    return this.doc.page.width - this.doc.page.margins.left - this.doc.page.margins.right;
  }

  /** Room left on the current page, pt. */
  remaining(): number {
    return this.doc.page.height - this.doc.page.margins.bottom - this.doc.y;
  }

  /** Starts a new page unless `space` pt fit on this one (a block is never split from its heading). */
  ensure(space: number): void {
    if (space > this.remaining()) this.doc.addPage();
  }

  /** How full the page being written is, 0 to 1 (the tests hold the last page to it). */
  pageFill(): number {
    const d = this.doc;
    return (d.y - d.page.margins.top) / (d.page.height - d.page.margins.top - d.page.margins.bottom);
  }

  title(kicker: string, title: string, sub: string): this {
    const d = this.doc;
    d.font(this.fr).fontSize(9).fillColor(BEAM).text(this.t(kicker.toUpperCase()), { characterSpacing: 1.2 });
    d.moveDown(0.2).font(this.fb).fontSize(20).fillColor(INK).text(this.t(title));
    d.moveDown(0.2).font(this.fr).fontSize(9).fillColor(MUTED).text(this.t(sub));
    d.moveDown(0.8);
    return this;
  }

  heading(text: string): this {
    this.ensure(60);
    this.doc.moveDown(0.6).font(this.fb).fontSize(12).fillColor(INK).text(this.t(text), this.doc.page.margins.left);
    this.doc.moveDown(0.3);
    return this;
  }

  paragraph(text: string, opts: { muted?: boolean; size?: number } = {}): this {
    this.ensure(30);
    this.doc.font(this.fr).fontSize(opts.size ?? 9.5).fillColor(opts.muted ? MUTED : INK).text(this.t(text), this.doc.page.margins.left, undefined, { width: this.width });
    this.doc.moveDown(0.4);
    return this;
  }

  bullets(items: string[], size = 9): this {
    for (const t of items) this.paragraph(`•  ${t}`, { size });
    return this;
  }

  private bulletsHeight(items: string[], size: number): number {
    const d = this.doc;
    d.font(this.fr).fontSize(size);
    // each paragraph is its text plus a 0.4-line gap
    return items.reduce((h, t) => h + d.heightOfString(this.t(`•  ${t}`), { width: this.width }) + d.currentLineHeight(true) * 0.4, 0);
  }

  /**
   * The last section of a report (a heading and bullets), measured before it is set: on the room
   * left when it fits, in a smaller size when only that fits, on a page of its own otherwise, so a
   * report never ends on a page that holds a bullet or two.
   */
  closingSection(heading: string, items: string[]): this {
    const d = this.doc;
    d.font(this.fb).fontSize(12);
    const head = d.currentLineHeight(true) * 1.9;
    for (const size of [9, 7.5]) {
      if (head + this.bulletsHeight(items, size) <= this.remaining()) return this.heading(heading).bullets(items, size);
    }
    d.addPage();
    return this.heading(heading).bullets(items);
  }

  /** A table; a cell's colour may mark pass and fail. Column widths are shares of the page width. */
  table(columns: PdfColumn[], rows: { cells: string[]; tone?: (string | undefined)[] }[]): this {
    const d = this.doc;
    const widths = this.columnWidths(columns, rows.map((r) => r.cells));
    const left = d.page.margins.left;
    const rowHeight = (cells: string[], bold: boolean) => {
      d.font(bold ? this.fb : this.fr).fontSize(8.5);
      return Math.max(...cells.map((c, i) => d.heightOfString(this.t(c), { width: (widths[i] ?? 40) - 6 }))) + 6;
    };
    const drawRow = (cells: string[], bold: boolean, tone?: (string | undefined)[]) => {
      const h = rowHeight(cells, bold);
      if (d.y + h > d.page.height - d.page.margins.bottom) d.addPage();
      const y = d.y;
      let x = left;
      cells.forEach((c, i) => {
        const w = widths[i] ?? 40;
        d.font(bold ? this.fb : this.fr).fontSize(8.5).fillColor(tone?.[i] === 'fail' ? FAIL : tone?.[i] === 'pass' ? PASS : bold ? MUTED : INK);
        d.text(this.t(c), x + 3, y + 3, { width: w - 6, align: columns[i]?.align ?? 'left' });
        x += w;
      });
      d.moveTo(left, y + h).lineTo(left + this.width, y + h).lineWidth(0.5).strokeColor(LINE).stroke();
      d.x = left;
      d.y = y + h;
    };
    drawRow(columns.map((c) => c.header), true);
    for (const r of rows) drawRow(r.cells, false, r.tone);
    d.moveDown(0.6);
    return this;
  }

  /**
   * Column widths from their shares of the page width, widened where a heading's (or a cell's)
   * longest word would not fit, so no word breaks in the middle; the room comes from the columns
   * with some to spare. When even that cannot fit every word the shares stand.
   */
  private columnWidths(columns: PdfColumn[], rows: string[][]): number[] {
    const d = this.doc;
    const total = columns.reduce((s, c) => s + c.width, 0);
    const base = columns.map((c) => (c.width / total) * this.width);
    const longest = (text: string, bold: boolean) => {
      d.font(bold ? this.fb : this.fr).fontSize(8.5);
      return Math.max(0, ...this.t(text).split(/\s+/).map((w) => d.widthOfString(w)));
    };
    // 6 pt of padding and 1 pt so rounding never pushes a word to the next line
    const need = columns.map((c, i) => Math.min(this.width * 0.45, Math.max(longest(c.header, true), ...rows.map((r) => longest(r[i] ?? '', false))) + 7));
    const short = base.reduce((s, w, i) => s + Math.max(0, need[i]! - w), 0);
    if (short <= 0) return base;
    const spare = base.map((w, i) => Math.max(0, w - need[i]!));
    const spareTotal = spare.reduce((s, v) => s + v, 0);
    if (spareTotal < short) return base;
    return base.map((w, i) => (need[i]! > w ? need[i]! : w - (spare[i]! * short) / spareTotal));
  }

  /** Groups along x; each with its captures as dots, the mean as a bar and the 95% CI as whiskers; targets as dashed lines. */
  chart(spec: ChartSpec, height = 200): this {
    const d = this.doc;
    this.ensure(height + 50);
    d.font(this.fb).fontSize(9.5).fillColor(INK).text(this.t(spec.title), d.page.margins.left);
    const top = d.y + 6;
    const left = d.page.margins.left + 44;
    const right = d.page.margins.left + this.width - 8;
    const bottom = top + height;
    const all: number[] = [];
    for (const g of spec.groups) {
      all.push(...g.points);
      for (const v of [g.mean, g.low, g.high]) if (v !== null && Number.isFinite(v)) all.push(v);
    }
    for (const t of spec.targets) all.push(t.value);
    // no axis below what the quantity can be (a ratio or a share is never negative, though a
    // small group's 95% CI may reach below zero: its whisker stops at the axis)
    const floor = spec.floor === undefined ? 0 : spec.floor;
    const clampLow = (v: number) => (floor === null ? v : Math.max(floor, v));
    for (let i = 0; i < all.length; i++) all[i] = clampLow(all[i]!);
    let lo = all.length ? Math.min(...all) : 0;
    let hi = all.length ? Math.max(...all) : 1;
    if (hi - lo < 1e-12) {
      lo -= Math.abs(lo) * 0.1 || 0.5;
      hi += Math.abs(hi) * 0.1 || 0.5;
    }
    // round ticks (1, 2 or 5 × 10^k apart) that read as numbers; no negative axis for quantities
    // that cannot be negative (ratios, fractions)
    const raw = (hi - lo) / 4;
    const mag = 10 ** Math.floor(Math.log10(raw));
    const tickStep = ([1, 2, 5, 10].find((f) => f * mag >= raw) ?? 10) * mag;
    lo = Math.floor(lo / tickStep) * tickStep;
    if (floor !== null) lo = Math.max(floor, lo);
    hi = Math.ceil(hi / tickStep) * tickStep;
    const ticks: number[] = [];
    for (let v = lo; v <= hi + tickStep / 2; v += tickStep) ticks.push(Number(v.toPrecision(12)));
    const y = (v: number) => bottom - ((clampLow(v) - lo) / (hi - lo)) * height;
    d.lineWidth(0.5).strokeColor(LINE);
    for (const v of ticks) {
      d.moveTo(left, y(v)).lineTo(right, y(v)).stroke();
      d.font(this.fr).fontSize(7).fillColor(MUTED).text(spec.tick ? spec.tick(v) : formatSig(v, 3), left - 42, y(v) - 3, { width: 38, align: 'right' });
    }
    d.moveTo(left, top).lineTo(left, bottom).lineTo(right, bottom).lineWidth(0.8).strokeColor(MUTED).stroke();
    const n = Math.max(spec.groups.length, 1);
    const step = (right - left) / n;
    spec.groups.forEach((g, i) => {
      const cx = left + step * (i + 0.5);
      if (g.highlight) d.rect(cx - step / 2 + 2, top, step - 4, height).fillOpacity(0.08).fill(BEAM).fillOpacity(1);
      g.points.forEach((p, j) => {
        const jx = cx + ((j % 7) - 3) * Math.min(3, step / 20);
        d.circle(jx, y(p), 2).fillColor(GLOW).fill();
      });
      if (g.low !== null && g.high !== null) {
        d.moveTo(cx, y(g.low)).lineTo(cx, y(g.high)).lineWidth(1.2).strokeColor(BEAM).stroke();
        for (const v of [g.low, g.high]) d.moveTo(cx - 5, y(v)).lineTo(cx + 5, y(v)).stroke();
      }
      if (g.mean !== null) d.moveTo(cx - 10, y(g.mean)).lineTo(cx + 10, y(g.mean)).lineWidth(2.2).strokeColor(BEAM).stroke();
      d.font(this.fr).fontSize(this.fitSize(g.label, step - 4, 7.5, 5.5)).fillColor(INK).text(this.t(g.label), cx - step / 2, bottom + 4, { width: step, align: 'center' });
    });
    for (const t of spec.targets) {
      d.moveTo(left, y(t.value)).lineTo(right, y(t.value)).dash(4, { space: 3 }).lineWidth(1).strokeColor(t.failing ? FAIL : PASS).stroke().undash();
      d.font(this.fr).fontSize(7).fillColor(t.failing ? FAIL : PASS).text(this.t(t.label), right - 200, y(t.value) - 9, { width: 198, align: 'right' });
    }
    d.x = d.page.margins.left;
    // below the group labels, however many lines they took
    d.font(this.fr).fontSize(7.5);
    const labelLines = Math.max(1, ...spec.groups.map((g) => Math.ceil(d.heightOfString(this.t(g.label), { width: step }) / d.currentLineHeight(true))));
    d.y = bottom + 10 + labelLines * d.currentLineHeight(true);
    d.font(this.fr).fontSize(7.5).fillColor(MUTED).text(this.t(`Dots: captures (newest reading each). Bar: mean. Whiskers: 95% CI of the mean (Student's t). Dashed: targets.${spec.unit ? ` Unit: ${spec.unit}.` : ''}`));
    d.moveDown(0.6);
    return this;
  }

  /** The largest size from `max` down to `min` at which the longest word of `text` fits `width`. */
  private fitSize(text: string, width: number, max: number, min: number): number {
    const d = this.doc;
    const words = this.t(text).split(/\s+/);
    for (let size = max; size > min; size -= 0.5) {
      d.font(this.fr).fontSize(size);
      if (Math.max(0, ...words.map((w) => d.widthOfString(w))) <= width) return size;
    }
    return min;
  }

  /**
   * Pictures side by side, `perRow` to a row, each scaled to its share of the width with its caption
   * below; a picture's regions are drawn on it as outlines with their name, in colours told apart
   * without colour vision (REGION_STYLE). A row is never split across pages.
   */
  figures(items: PdfFigure[], perRow = 2): this {
    const d = this.doc;
    const gap = 12;
    const cellW = (this.width - gap * (perRow - 1)) / perRow;
    for (let start = 0; start < items.length; start += perRow) {
      const row = items.slice(start, start + perRow);
      d.font(this.fr).fontSize(7.5);
      const imageH = Math.max(...row.map((f) => (cellW * f.height) / f.width));
      const captionH = Math.max(...row.map((f) => d.heightOfString(this.t(f.caption), { width: cellW })));
      this.ensure(imageH + captionH + 14);
      const top = d.y;
      row.forEach((f, i) => {
        const x = d.page.margins.left + i * (cellW + gap);
        const h = (cellW * f.height) / f.width;
        d.image(f.png, x, top, { width: cellW, height: h });
        d.rect(x, top, cellW, h).lineWidth(0.5).strokeColor(LINE).stroke();
        for (const r of f.regions ?? []) this.region(r, x, top, cellW, h);
        d.font(this.fr).fontSize(7.5).fillColor(MUTED).text(this.t(f.caption), x, top + h + 3, { width: cellW });
      });
      d.x = d.page.margins.left;
      d.y = top + imageH + captionH + 12;
    }
    return this;
  }

  private region(r: FigureRegion, x0: number, y0: number, w: number, h: number): void {
    const d = this.doc;
    const style = REGION_STYLE[r.kind];
    // fractions of the picture, kept inside it
    const x = x0 + Math.max(0, Math.min(1, r.x)) * w;
    const y = y0 + Math.max(0, Math.min(1, r.y)) * h;
    const rw = Math.max(1, Math.min(1 - Math.max(0, r.x), r.w) * w);
    const rh = Math.max(1, Math.min(1 - Math.max(0, r.y), r.h) * h);
    d.save();
    if (style.pattern === 'dashed') d.dash(4, { space: 2 });
    if (style.pattern === 'dotted') d.dash(1.2, { space: 1.8 });
    d.rect(x, y, rw, rh).lineWidth(1.2).strokeColor(style.colour).stroke();
    d.undash();
    d.font(this.fb).fontSize(6);
    const label = this.t(style.label);
    const lw = d.widthOfString(label) + 4;
    // the ghost (a shifted copy of the screen) is named at its lower right, the others at their upper left
    const lx = r.kind === 'ghost' ? Math.max(x0, Math.min(x + rw - lw, x0 + w - lw)) : Math.min(x, x0 + w - lw);
    const ly = r.kind === 'ghost' ? (y + rh + 9 <= y0 + h ? y + rh + 1 : y + rh - 9) : y - 9 >= y0 ? y - 9 : y + 1;
    d.rect(lx, ly, lw, 8).fillColor(style.colour).fill();
    d.fillColor(INK).text(label, lx + 2, ly + 1, { lineBreak: false });
    d.restore();
  }

  /** Ends the document, numbering the pages, and gives back its bytes. */
  async finish(footer: string): Promise<Buffer> {
    const range = this.doc.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      this.doc.switchToPage(i);
      const bottom = this.doc.page.height - 30;
      const m = this.doc.page.margins.bottom;
      this.doc.page.margins.bottom = 0;
      this.doc.font(this.fr).fontSize(7).fillColor(MUTED).text(this.t(`${footer} · page ${i + 1} of ${range.count}`), this.doc.page.margins.left, bottom, { width: this.width, align: 'center', lineBreak: false });
      this.doc.page.margins.bottom = m;
    }
    this.doc.end();
    return this.done;
  }
}

export function pdfResponse(bytes: Buffer, name: string): Response {
  return new Response(new Uint8Array(bytes), {
    status: 200,
    headers: { 'content-type': 'application/pdf', 'content-disposition': `attachment; filename="${name}.pdf"`, 'content-length': String(bytes.byteLength), 'cache-control': 'private, no-store' },
  });
}
