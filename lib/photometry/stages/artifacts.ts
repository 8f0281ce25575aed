import { luminanceHistogram } from '../histogram';
import type { AnalysisMaps } from '../result';
import type { Plane, PhotoRole } from '../types';
import { cached, type AnalysisMemo } from './memo';
import type { Normalised } from './normalise';

/** The planes behind the artifacts (docs/method.md §5.9): log10(on/off) per pixel, D, and each photo's histogram. */
export function analysisMaps(n: Normalised, diffSmall: Plane, offSmall: Plane, diffKey: string, memo: AnalysisMemo | null): AnalysisMaps {
  const logContrast = cached(memo, `log-contrast:${diffKey}`, () => {
    const lc = new Float32Array(diffSmall.data.length);
    const onS = (n.small.on as Plane).data;
    const offS = offSmall.data;
    for (let i = 0, len = lc.length; i < len; i++) {
      const a = onS[i] as number;
      const b = offS[i] as number;
      lc[i] = a > 0 && b > 0 ? Math.log10(a / b) : Number.NaN;
    }
    return lc;
  });
  const histograms: AnalysisMaps['histograms'] = {};
  for (const role of n.roles) {
    const p = n.small[role] as Plane;
    histograms[role as PhotoRole] = cached(memo, `histogram:${n.key[role]}`, () => luminanceHistogram(p.data, 96, -14, 2, Math.max(1, Math.floor(p.data.length / 250_000))));
  }
  return { factor: n.factor, logContrast: { data: logContrast, width: diffSmall.width, height: diffSmall.height }, difference: diffSmall, histograms };
}
