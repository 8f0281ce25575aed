import { existsSync } from 'node:fs';
import PDFDocument from 'pdfkit';
import { formatSig } from '../format';

/** One column of a PDF table: share of the width and alignment. */
export type PdfColumn = { header: string; width: number; align?: 'left' | 'right' };

export type ChartGroup = { label: string; mean: number | null; low: number | null; high: number | null; points: number[]; highlight?: boolean };
export type ChartSpec = { title: string; unit: string; groups: ChartGroup[]; targets: { value: number; label: string; failing?: boolean }[]; tick?: (v: number) => string };

// A Unicode font prints ΔE00, ≥ and accented or Greek names as they are; without one the built-in
// Helvetica (WinAnsi only) is used and pdfText spells those symbols out.
const FONT_DIRS = [process.env.VEILMETER_PDF_FONT_DIR, '/usr/share/fonts/truetype/dejavu'].filter((d): d is string => !!d);
function unicodeFonts(): { regular: string; bold: string } | null {
  for (const dir of FONT_DIRS) {
    const regular = `${dir}/DejaVuSans.ttf`;
    const bold = `${dir}/DejaVuSans-Bold.ttf`;
    if (existsSync(regular) && existsSync(bold)) return { regular, bold };
  }
  return null;
}

const INK = '#18202c';
const MUTED = '#5c687a';
const LINE = '#c9d1dc';
const BEAM = '#0d8076';
const GLOW = '#b06a00';
const FAIL = '#c02c2c';
const PASS = '#1e8449';

// The built-in Helvetica speaks WinAnsi only: symbols outside it become plain-text equivalents.
const REPLACE: Record<string, string> = { '≥': '>=', '≤': '<=', 'Δ': 'Delta ', '−': '-', '≈': '~', '×': 'x', '√': 'sqrt', '…': '...', '→': '->', '·': '·', '²': '²', '±': '±' };

/** Text that Helvetica can set: known symbols spelled out, anything else outside Latin-1 dropped to '?'. */
export function pdfText(s: string, unicode = false): string {
  if (unicode) return s;
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
  private readonly unicode: boolean;

  constructor(title: string, opts: { compress?: boolean } = {}) {
    this.doc = new PDFDocument({ size: 'A4', margin: 48, bufferPages: true, compress: opts.compress ?? true, info: { Title: pdfText(title), Author: 'Veilmeter', Creator: 'Veilmeter' } });
    const fonts = unicodeFonts();
    this.unicode = fonts !== null;
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

  private ensure(space: number): void {
    if (this.doc.y + space > this.doc.page.height - this.doc.page.margins.bottom) this.doc.addPage();
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

  bullets(items: string[]): this {
    for (const t of items) this.paragraph(`•  ${t}`, { size: 9 });
    return this;
  }

  /** A table; a cell's colour may mark pass and fail. Column widths are shares of the page width. */
  table(columns: PdfColumn[], rows: { cells: string[]; tone?: (string | undefined)[] }[]): this {
    const d = this.doc;
    const total = columns.reduce((s, c) => s + c.width, 0);
    const widths = columns.map((c) => (c.width / total) * this.width);
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
    const nonNegative = lo >= 0;
    lo = Math.floor(lo / tickStep) * tickStep;
    if (nonNegative) lo = Math.max(0, lo);
    hi = Math.ceil(hi / tickStep) * tickStep;
    const ticks: number[] = [];
    for (let v = lo; v <= hi + tickStep / 2; v += tickStep) ticks.push(Number(v.toPrecision(12)));
    const y = (v: number) => bottom - ((v - lo) / (hi - lo)) * height;
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
      d.font(this.fr).fontSize(7.5).fillColor(INK).text(this.t(g.label), cx - step / 2, bottom + 4, { width: step, align: 'center' });
    });
    for (const t of spec.targets) {
      d.moveTo(left, y(t.value)).lineTo(right, y(t.value)).dash(4, { space: 3 }).lineWidth(1).strokeColor(t.failing ? FAIL : PASS).stroke().undash();
      d.font(this.fr).fontSize(7).fillColor(t.failing ? FAIL : PASS).text(this.t(t.label), right - 200, y(t.value) - 9, { width: 198, align: 'right' });
    }
    d.x = d.page.margins.left;
    d.y = bottom + 22;
    d.font(this.fr).fontSize(7.5).fillColor(MUTED).text(this.t(`Dots: captures (newest reading each). Bar: mean. Whiskers: 95% CI of the mean (Student's t). Dashed: targets.${spec.unit ? ` Unit: ${spec.unit}.` : ''}`));
    d.moveDown(0.6);
    return this;
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
