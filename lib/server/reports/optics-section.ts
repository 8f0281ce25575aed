import { mtfPlotPng } from '../../image/mtf-plot';
import type { CaptureResult } from '../../photometry/result';
import type { ReportWriter } from '../../reports/pdf';

const fix = (v: number | null | undefined, digits: number): string => (typeof v === 'number' && Number.isFinite(v) ? v.toFixed(digits) : '—');

const SOURCE: Record<NonNullable<CaptureResult['geometry']>['source'], string> = {
  'camera-profile': 'camera profile',
  'exif-focal-sensor': 'EXIF focal length and sensor',
  'exif-35mm': 'EXIF 35 mm equivalent',
};

/**
 * The sharpness (MTF curve and MTF50), field of view and display colour of a reading in the
 * capture report (docs/method.md §5.10–5.12); nothing when the reading has none of them.
 */
export async function opticsSection(w: ReportWriter, result: CaptureResult): Promise<void> {
  const s = result.sharpness ?? null;
  const g = result.geometry ?? null;
  const c = result.displayColour ?? null;
  if (!s && !g && !c) return;
  w.heading('Sharpness, field of view and display colour');
  const rows: { cells: string[] }[] = [];
  if (s) {
    rows.push({ cells: ['MTF50', `${fix(s.mtf50, 3)} cycles/pixel`, 'Frequency where fine detail keeps half its contrast'] });
    rows.push({ cells: ['MTF50 per degree', s.mtf50PerDegree === null ? '—' : `${fix(s.mtf50PerDegree, 2)} cycles/°`, 'MTF50 over the angle of one camera pixel'] });
    rows.push({ cells: ['Edge angle', `${fix(s.edgeAngle, 2)}°`, 'Mean turn of the square’s sides from the pixel grid'] });
  }
  if (g) {
    rows.push({ cells: ['Field of view H × V, diagonal', `${fix(g.fovH, 2)}° × ${fix(g.fovV, 2)}°, ${fix(g.fovD, 2)}°`, 'Angles the screen spans, through a pinhole camera'] });
    rows.push({ cells: ['Camera angle per pixel', `${fix(g.degreesPerPixel, 5)}°`, `At the frame’s centre, from the ${SOURCE[g.source]}`] });
    rows.push({ cells: ['Display pixels per degree', g.pixelsPerDegree === null ? '—' : fix(g.pixelsPerDegree, 1), 'Display pixels along the screen’s width over its field of view'] });
  }
  if (c) {
    rows.push({ cells: ['Chromaticity x, y', `${fix(c.x, 4)}, ${fix(c.y, 4)}`, 'CIE 1931, of the display’s light over the screen'] });
    rows.push({ cells: ['Chromaticity u′, v′', `${fix(c.u, 4)}, ${fix(c.v, 4)}`, 'CIE 1976 UCS'] });
    rows.push({ cells: ['Correlated colour temperature', c.cct === null ? '—' : `${Math.round(c.cct)} K`, 'McCamy; none far from the black-body locus'] });
    rows.push({ cells: [`Δu′v′ from ${c.whiteRef === 'D65' ? 'D65' : 'the display’s white'}`, fix(c.duvFromWhite, 4), 'Distance in the u′v′ diagram'] });
    rows.push({ cells: ['Colour uniformity (Δu′v′)', fix(c.uniformityDuv, 4), 'Largest Δu′v′ between two cells of the 3 × 3 grid'] });
  }
  w.table(
    [
      { header: 'Quantity', width: 3 },
      { header: 'Value', width: 2, align: 'right' },
      { header: 'Meaning', width: 4 },
    ],
    rows,
  );
  if (s) {
    const plot = await mtfPlotPng(s.curve, s.mtf50);
    w.figures([{ ...plot, caption: `MTF against spatial frequency (0 to 1 cycle per camera pixel, grid every 0.1); dashed: MTF 0.5; dotted: Nyquist, 0.5 cycle per pixel; dot: MTF50 = ${fix(s.mtf50, 3)}` }], 1);
  }
}
