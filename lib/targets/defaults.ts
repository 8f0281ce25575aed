import type { TargetCondition } from './conditions';
import type { MetricKey } from './metrics';

/** How sure the figure behind a default is (the words docs/references.md uses). */
export type SourceStatus = 'published' | 'derived' | 'common practice' | 'from memory';

export type DefaultTarget = {
  id: string;
  metric: MetricKey;
  comparator: '>=' | '<=';
  value: number;
  conditionNote: string;
  /** The structured part of the condition, where the default names one. */
  condition?: TargetCondition;
  /** Where the figure comes from, in plain words, with its status. */
  basis: string;
  status: SourceStatus;
};

/**
 * Starting points a lead can adopt. None is a requirement: head-up displays fall outside the
 * in-vehicle contrast minimums, and the HUD measurement method sets no thresholds, so the team
 * decides its own targets.
 */
export const DEFAULT_TARGETS: DefaultTarget[] = [
  {
    id: 'acr-bright-sky',
    metric: 'ambientContrastRatio',
    comparator: '>=',
    value: 1.2,
    conditionNote: 'against a very bright background, 10,000 fL (about 34,260 cd/m²)',
    condition: { backgroundCdm2Min: 30_000 },
    basis: 'Figure widely quoted as the minimum for airborne HUDs; the standard itself was not read.',
    status: 'from memory',
  },
  {
    id: 'acr-legible',
    metric: 'ambientContrastRatio',
    comparator: '>=',
    value: 7,
    conditionNote: 'at the background the team tests against',
    basis: 'Legibility research on HUD contrasts from 1.2:1 to 8:1 found the best legibility near 7:1 (Wan & Tsimhoni, J. Soc. Inf. Display, 2021).',
    status: 'published',
  },
  {
    id: 'uniformity-75',
    metric: 'uniformity',
    comparator: '>=',
    value: 0.75,
    conditionNote: 'full-white pattern, 3 × 3 grid, min/max',
    condition: { pattern: 'full' },
    basis: 'A level panel data sheets commonly state for 9-point uniformity.',
    status: 'published',
  },
];

/** Said beside every default so nobody mistakes it for a rule. */
export const DEFAULTS_CAVEAT =
  'Defaults are starting points, not requirements: in-vehicle display standards exclude head-up displays from their contrast minimums and the HUD measurement method sets no thresholds, so these targets are the team’s own.';
