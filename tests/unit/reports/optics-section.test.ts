import { PDFParse } from 'pdf-parse';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { mtfPlotPng } from '../../../lib/image/mtf-plot';
import type { CaptureResult } from '../../../lib/photometry/result';
import { ReportWriter } from '../../../lib/reports/pdf';
import { opticsSection } from '../../../lib/server/reports/optics-section';

const curve = Array.from({ length: 101 }, (_, i) => ({ f: i / 100, mtf: Math.exp(-2 * Math.PI * Math.PI * 1.5 * 1.5 * (i / 100) ** 2) }));
const optics: Pick<CaptureResult, 'sharpness' | 'geometry' | 'displayColour'> = {
  sharpness: { mtf50: 0.1249, mtf50PerDegree: 12.49, edgeAngle: 5.02, curve },
  geometry: { fovH: 7.153, fovV: 4.771, fovD: 8.594, degreesPerPixel: 0.0119366, source: 'exif-focal-sensor', pixelsPerDegree: 178.95 },
  displayColour: { x: 0.3101, y: 0.3276, u: 0.1963, v: 0.4666, cct: 6650, duvFromWhite: 0.0021, whiteRef: 'D65', uniformityDuv: 0.0034 },
};

async function text(bytes: Buffer): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  const r = await parser.getText();
  await parser.destroy();
  return r.pages.map((p) => p.text).join('\n');
}

describe('the capture report’s optics section', () => {
  it('prints MTF50, the field of view and the display colour with units, and draws the MTF curve', async () => {
    const w = new ReportWriter('optics', { compress: false });
    await opticsSection(w, optics as CaptureResult);
    const bytes = await w.finish('Veilmeter · test');
    const t = await text(bytes);
    expect(t).toContain('Sharpness, field of view and display colour');
    expect(t).toContain('0.125 cycles/pixel');
    expect(t).toContain('12.49 cycles/°');
    expect(t).toContain('7.15° × 4.77°, 8.59°');
    expect(t).toContain('178.9');
    expect(t).toContain('0.3101, 0.3276');
    expect(t).toContain('6650 K');
    expect(t).toMatch(/MTF50 = 0\.125/);
    // the figure is embedded as an image
    expect(bytes.toString('latin1')).toContain('/Subtype /Image');
  });

  it('adds nothing for a reading without these figures', async () => {
    const w = new ReportWriter('none', { compress: false });
    await opticsSection(w, {} as CaptureResult);
    const t = await text(await w.finish('Veilmeter · test'));
    expect(t).not.toContain('Sharpness');
  });

  it('draws the curve falling through MTF 0.5 at the MTF50 marker', async () => {
    const { png, width, height } = await mtfPlotPng(curve, 0.1249, { width: 900, height: 480 });
    const { data, info } = await sharp(png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    expect([info.width, info.height]).toEqual([width, height]);
    // the marker's orange at (left + plot width · MTF50, the 0.5 line)
    const x = Math.round(70 + (900 - 70 - 24) * 0.1249);
    const y = Math.round(20 + (480 - 20 - 60) * 0.5);
    const i = (y * info.width + x) * 3;
    expect(data[i]).toBeGreaterThan(180);
    expect(data[i + 2]).toBeLessThan(80);
  });
});
