import type { CaptureResult } from '@/lib/photometry/result';
import { MetricRowsTable, type MetricRow } from './metric-rows-table';
import { MtfChart } from './mtf-chart';

type Row = MetricRow;

const fix = (v: number | null | undefined, digits: number) => (typeof v === 'number' && Number.isFinite(v) ? v.toFixed(digits) : '—');

const SOURCE: Record<NonNullable<CaptureResult['geometry']>['source'], string> = {
  'camera-profile': 'from the camera profile (measured on a target of known angle)',
  'exif-focal-sensor': 'from the EXIF focal length and sensor size',
  'exif-35mm': 'from the EXIF 35 mm equivalent focal length',
};

/**
 * Sharpness (the MTF curve and MTF50), field of view and the display's colour of one reading
 * (docs/method.md §5.10–5.12), each figure with its unit and a one-line definition. Renders nothing
 * for a reading that has none of them (older engines, or no EXIF and a pattern without an edge).
 */
export function OpticsDetails({ result }: { result: CaptureResult }) {
  const s = result.sharpness ?? null;
  const g = result.geometry ?? null;
  const c = result.displayColour ?? null;
  if (!s && !g && !c) return null;
  const geometry: Row[] = g
    ? [
        { key: 'fovH', label: 'Field of view, horizontal', value: fix(g.fovH, 2), unit: '°', definition: 'Angle across the screen’s middle row, as the eye behind the optics sees it (pinhole camera).' },
        { key: 'fovV', label: 'Field of view, vertical', value: fix(g.fovV, 2), unit: '°', definition: 'Angle across the screen’s middle column.' },
        { key: 'fovD', label: 'Field of view, diagonal', value: fix(g.fovD, 2), unit: '°', definition: 'Angle from one corner of the screen to the opposite one.' },
        { key: 'dpp', label: 'Camera angle per pixel', value: fix(g.degreesPerPixel, 5), unit: '°/pixel', definition: `Angle one camera pixel spans at the frame’s centre, ${SOURCE[g.source]}.` },
        {
          key: 'ppd',
          label: 'Display pixels per degree',
          value: fix(g.pixelsPerDegree, 1),
          unit: 'pixels/°',
          definition: g.pixelsPerDegree === null ? 'Enter the display’s resolution on the stack’s display element to get it.' : 'The display’s pixels along the screen’s horizontal over its horizontal field of view.',
        },
      ]
    : [];
  const colour: Row[] = c
    ? [
        { key: 'xy', label: 'Chromaticity x, y', value: `${fix(c.x, 4)}, ${fix(c.y, 4)}`, unit: 'CIE 1931', definition: 'Colour of the display’s light over the screen (on − off, or the dark photo), as the camera’s colour reads it.' },
        { key: 'uv', label: 'Chromaticity u′, v′', value: `${fix(c.u, 4)}, ${fix(c.v, 4)}`, unit: 'CIE 1976 UCS', definition: 'The same colour in the diagram where distances match seen differences better.' },
        { key: 'cct', label: 'Correlated colour temperature', value: c.cct === null ? '—' : String(Math.round(c.cct)), unit: 'K', definition: c.cct === null ? 'Not given: the colour lies far from the black-body locus or outside 2000–10 000 K.' : 'The black-body temperature of the nearest colour (McCamy’s formula).' },
        { key: 'duvWhite', label: `Δu′v′ from ${c.whiteRef === 'D65' ? 'D65' : 'the display’s white'}`, value: fix(c.duvFromWhite, 4), unit: 'Δu′v′', definition: c.whiteRef === 'D65' ? 'Distance of the colour from the D65 white; enter the display’s own white on the stack to compare with it.' : 'Distance of the colour from the display’s own white entered on the stack.' },
        {
          key: 'uniformityDuv',
          label: 'Colour uniformity',
          value: fix(c.uniformityDuv, 4),
          unit: 'Δu′v′',
          definition: c.uniformityDuv === null ? 'Measured on a full-white screen only.' : 'Largest Δu′v′ between any two cells of the screen’s 3 × 3 grid (0 is perfectly even).',
        },
      ]
    : [];
  return (
    <div className="space-y-5" data-testid="optics-details">
      {s ? (
        <section>
          <h3 className="mb-2 text-xs font-semibold uppercase tracking-[0.16em] text-muted">Sharpness (slanted edge)</h3>
          <MetricRowsTable
            testId="sharpness"
            rows={[
              { key: 'mtf50', label: 'MTF50', value: fix(s.mtf50, 3), unit: 'cycles/pixel', definition: 'Spatial frequency where the contrast of fine detail falls to half, per camera pixel.' },
              { key: 'mtf50PerDegree', label: 'MTF50 per degree', value: fix(s.mtf50PerDegree, 2), unit: 'cycles/°', definition: s.mtf50PerDegree === null ? 'Needs the field of view: a camera profile’s angle per pixel or the EXIF focal length.' : 'The same over the angle one camera pixel spans: comparable across cameras.' },
              { key: 'edgeAngle', label: 'Edge angle', value: fix(s.edgeAngle, 2), unit: '°', definition: 'Mean turn of the square’s sides from the pixel grid (about 5° is best; near 0° or 45° fails).' },
            ]}
          />
          <MtfChart curve={s.curve} mtf50={s.mtf50} />
        </section>
      ) : null}
      {g ? (
        <section>
          <h3 className="mb-2 text-xs font-semibold uppercase tracking-[0.16em] text-muted">Field of view</h3>
          <MetricRowsTable testId="geometry" rows={geometry} />
        </section>
      ) : null}
      {c ? (
        <section>
          <h3 className="mb-2 text-xs font-semibold uppercase tracking-[0.16em] text-muted">Display colour</h3>
          <MetricRowsTable testId="display-colour" rows={colour} />
        </section>
      ) : null}
    </div>
  );
}
