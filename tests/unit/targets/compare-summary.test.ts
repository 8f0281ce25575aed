import { describe, expect, it } from 'vitest';
import { changeTone, compareGroups, summariseComparison } from '../../../lib/targets/compare';
import { METRIC_KEYS, type MetricKey } from '../../../lib/targets/metrics';
import type { SetReading } from '../../../lib/targets/series';

// Invented readings: the polarizer raises the contrast and costs see-through transmission.
let seq = 0;
function reading(variant: string, acr: number, transmission: number, ghost: number): SetReading {
  const values = Object.fromEntries(METRIC_KEYS.map((k) => [k, null])) as Record<MetricKey, number | null>;
  Object.assign(values, { ambientContrastRatio: acr, transmission, ghostRatio: ghost });
  seq++;
  return { readingId: `r${seq}`, captureSetId: `c${seq}`, captureLabel: `#${seq}`, revisionId: 'rev', variant, createdAt: new Date(seq), values };
}
const a = [[2.28, 0.75, 0.006], [2.3, 0.76, 0.0061], [2.26, 0.74, 0.0059], [2.29, 0.755, 0.006], [2.27, 0.76, 0.0062]].map(([x, t, g]) => reading('no polarizer', x!, t!, g!));
const b = [[7.3, 0.44, 0.0061], [7.35, 0.45, 0.0059], [7.28, 0.43, 0.006], [7.4, 0.445, 0.0062], [7.31, 0.44, 0.006]].map(([x, t, g]) => reading('with polarizer', x!, t!, g!));
const rows = compareGroups({ label: 'VX-B · no polarizer', readings: a }, { label: 'VX-B · with polarizer', readings: b });

describe('comparison summary', () => {
  it('names every metric that moved, gains and losses together, with figures from lib/format', () => {
    const s = summariseComparison('VX-B · no polarizer', 'VX-B · with polarizer', rows);
    expect(s.gains).toEqual(['ambientContrastRatio']);
    expect(s.losses).toEqual(['transmission']);
    expect(s.unclear).toEqual(['ghostRatio']);
    expect(s.text).toMatch(/Gains: raises the ambient contrast ratio by 5\.048 ± 0\.058 \(p < 0\.001\)\./);
    expect(s.text).toMatch(/Losses: lowers the see-through transmission by 31\.2 ± 1\.2 percentage points \(p < 0\.001\)\./);
    expect(s.text).toMatch(/Not clearly changed: ghost ratio\./);
  });

  it('colours by what is good for the team’s targets, not by significance alone', () => {
    const trans = rows.find((r) => r.metric === 'transmission')!;
    expect(trans.level).toBe('unlikely-noise'); // significant, yet a loss
    expect(changeTone(trans)).toBe('bad');
    const acr = rows.find((r) => r.metric === 'ambientContrastRatio')!;
    expect(changeTone(acr)).toBe('good');
    // a team whose target asks for a low contrast (an odd target, but theirs) sees the rise as bad
    expect(changeTone(acr, [{ metric: 'ambientContrastRatio', comparator: '<=' }])).toBe('bad');
    expect(changeTone(rows.find((r) => r.metric === 'ghostRatio')!)).toBe('unclear');
  });
});
