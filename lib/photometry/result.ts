import type { LuminanceHistogram } from './histogram';
import type { Offset, Pattern, Plane, PhotoRole, Rect } from './types';

/** Every warning the engine can attach to a reading. */
export const WARNING_CODES = [
  'clipped',
  'shifted',
  'exposure-unknown',
  'transmission-over-screen',
  'checkerboard-unclear',
  'low-signal',
  'ghost-band-clipped',
  'calibration-needs-exposure',
  'rotated',
  'registration-uncertain',
  'screen-fills-frame',
  'multi-page',
  'ratio-near-one',
  'uniformity-invalid',
  'transmission-above-one',
  'both-clipped',
  'display-off',
  'sharpness-unmeasured',
  'see-through-range-small',
  'see-through-unfitted',
  'orientation-unclear',
] as const;

export type WarningCode = (typeof WARNING_CODES)[number];

export interface EngineWarning {
  code: WarningCode;
  message: string;
}

export interface GhostResult {
  /** Ghost luminance over primary luminance, second-order corrected. */
  ratio: number;
  /** Ghost position minus screen position, full-resolution pixels. */
  dx: number;
  dy: number;
  source: 'marked' | 'detected';
  /** B/S1, the uncorrected first-order estimate. */
  firstOrder: number;
  /**
   * The ghost's one-sided excess (band at the offset minus the mirrored band) in standard errors of
   * block means, measured at full resolution; a marked ghost carries it too (older readings: null
   * when marked).
   */
  snr: number | null;
  /** Pixels around the screen and inside the ghost's border left out of the band (the edge zone). */
  edgeZone?: number;
  /** Mean D over the mirrored band (offset −d) over mean D over the screen: light spread on every side alike. */
  mirrorRatio?: number;
  /** Share of the band's light that is one-sided, (band − mirror)/band. */
  oneSided?: number;
}

/** How one photo was aligned onto the on photo (docs/method.md §5.6). */
export interface AlignmentDetail {
  /** Translation at the frame's centre, px, to 0.1 px. */
  dx: number;
  dy: number;
  /** Camera turn, degrees (positive: clockwise on screen), to 0.01°. */
  rotationDeg: number;
  /** Correlation peak over the highest value away from it (above ~1.25 the match is unambiguous). */
  peakRatio: number;
  /** Full-resolution windows that agreed, and how far apart at most (px). */
  windows: number;
  spread: number;
  /** RMS residual after alignment over the RMS signal (median over windows). */
  residual: number | null;
}

export interface GhostAndUniformity {
  ghost: GhostResult | null;
  uniformity: number | null;
  uniformityCells: number[] | null;
}

/** The light the optics add to the see-through view: the intercept of off = T·ambient + veil (docs/method.md §5.8). */
export interface VeilResult {
  /** Intercept over the mean ambient luminance of the fit region (a fraction). */
  relative: number;
  /** Intercept in cd/m² when the reading has calibrated absolute luminance, else null. */
  cdm2: number | null;
  /** Per channel: slope T and the intercept over that channel's mean ambient level (null for grey photos). */
  channels: { r: { t: number; veil: number }; g: { t: number; veil: number }; b: { t: number; veil: number } } | null;
  /** 95th over 5th percentile of the ambient luminance over the fit region (how well slope and intercept separate). */
  rangeRatio: number;
  /** The marked background region, or the frame outside the screen, its edge zone and the ghost. */
  source: 'background' | 'outside-screen';
}

/** The metrics that carry a standard uncertainty (same names as the readings' metric keys). */
export const UNCERTAIN_METRICS = ['ambientContrastRatio', 'michelson', 'ansiContrast', 'uniformity', 'ghostRatio', 'transmission', 'transmissionOptics', 'veil'] as const;
export type UncertainMetric = (typeof UNCERTAIN_METRICS)[number];

/** Slanted-edge sharpness of the virtual image (docs/method.md §5.10). */
export interface SharpnessResult {
  /** Frequency where the MTF falls to 0.5, cycles per camera pixel. */
  mtf50: number;
  /** The same in cycles per degree of the view (null without a field of view). */
  mtf50PerDegree: number | null;
  /** Mean turn of the square's sides from the pixel rows and columns, degrees. */
  edgeAngle: number;
  /** MTF every 0.01 cycle per camera pixel from 0 to 1. */
  curve: { f: number; mtf: number }[];
}

/** Field of view of the screen rectangle and angular resolution (docs/method.md §5.11). */
export interface GeometryResult {
  /** Degrees across the screen's middle row, middle column and diagonal. */
  fovH: number;
  fovV: number;
  fovD: number;
  /** Angle of one camera pixel at the frame's centre, degrees. */
  degreesPerPixel: number;
  source: 'camera-profile' | 'exif-focal-sensor' | 'exif-35mm';
  /** Display pixels per degree along the screen's horizontal (null without the display's resolution). */
  pixelsPerDegree: number | null;
}

/** The display's colour through the optics (docs/method.md §5.12). */
export interface DisplayColourResult {
  /** CIE 1931 chromaticity. */
  x: number;
  y: number;
  /** CIE 1976 u′, v′. */
  u: number;
  v: number;
  /** Correlated colour temperature, K (null off the Planckian locus or outside 2000–10 000 K). */
  cct: number | null;
  /** Δu′v′ from the reference white. */
  duvFromWhite: number;
  whiteRef: 'D65' | 'display';
  /** Largest Δu′v′ between two cells of the 3 × 3 grid (full-white pattern only). */
  uniformityDuv: number | null;
}

/** One reading of the engine: the JSON shape of docs/method.md §5 plus a few extra keys. */
export interface CaptureResult {
  engineVersion: string;
  image: { width: number; height: number };
  pattern: Pattern;
  registration: { off: Offset; ambient: Offset | null; dark: Offset | null };
  screen: Rect & { source: 'marked' | 'detected' };
  background: Rect | null;
  luminance: { on: number; off: number; ambient: number | null; dark: number | null };
  /** cd/m² from a camera profile (`calibrated`) or from the meter equation (`rough-estimate`). */
  absoluteLuminance: { kind: 'calibrated' | 'rough-estimate'; on: number; off: number; ambient: number | null } | null;
  ambientContrastRatio: number | null;
  michelson: number | null;
  ansiContrast: number | null;
  checkerboard: { white: number; black: number; whiteParity: 0 | 1; separation: number } | null;
  uniformity: number | null;
  uniformityCells: number[] | null;
  ghost: GhostResult | null;
  /** Ghost and uniformity from on − off and, with a dark photo, from the dark photo (which the main keys prefer). */
  variants: { onMinusOff: GhostAndUniformity; dark: GhostAndUniformity | null };
  transmission: number | null;
  tint: { dx: number; dy: number; deltaE00: number; off: { x: number; y: number }; ambient: { x: number; y: number } } | null;
  clippedFraction: number;
  clippedByPhoto: Partial<Record<PhotoRole, number>>;
  exposure: { known: boolean; scales: Partial<Record<PhotoRole, number>> };
  warnings: EngineWarning[];
  /** Sub-pixel alignment, rotation and its quality per photo (engine 1.1.0 on). */
  alignment?: Partial<Record<'off' | 'ambient' | 'dark', AlignmentDetail>>;
  /** The screen's edge spread (10–90% rise, px) and the edge zone left out of ghost bands (px). */
  edge?: { spread: number; zone: number };
  /** The optics' own transmission: the slope T of off = T·ambient + veil (engine 1.2.0 on). */
  transmissionOptics?: number | null;
  /** The intercept of that fit (engine 1.2.0 on). */
  veil?: VeilResult | null;
  /**
   * Standard uncertainty (k = 1) of each metric given, on its stored scale (a ratio, a fraction),
   * from the photos' own noise, quantisation and registration (engine 1.2.0 on; older readings: none).
   */
  uncertainty?: Partial<Record<UncertainMetric, number>>;
  /** Slanted-edge MTF, with pattern slanted-edge (engine 1.2.0 on). */
  sharpness?: SharpnessResult | null;
  /** Field of view from a camera profile or the EXIF focal length (engine 1.2.0 on). */
  geometry?: GeometryResult | null;
  /** The display's chromaticity, CCT and colour uniformity (engine 1.2.0 on). */
  displayColour?: DisplayColourResult | null;
  /** How the orientation marker arrived at the camera, with pattern orientation (engine 1.2.0 on). */
  orientation?: OrientationResult | null;
}

/** The orientation marker as seen through the optics: mirrored or not, turned or not, and how clearly. */
export interface OrientationResult {
  orientation: 'normal' | 'mirrored' | 'upside-down-mirrored' | 'rotated-180';
  /** An odd number of reflections on the way: the image is mirror-reversed. */
  mirrored: boolean;
  /** Best correlation minus the runner-up (0..2): under 0.1 the photo does not tell. */
  margin: number;
  scores: Record<'normal' | 'mirrored' | 'upside-down-mirrored' | 'rotated-180', number>;
}

/** Downsampled planes behind the artifacts. */
export interface AnalysisMaps {
  /** Downsampling factor from the photos to these planes. */
  factor: number;
  /** log10(on/off) per pixel, aligned. */
  logContrast: Plane;
  /** D = on − off (aligned), on the on photo's scale. */
  difference: Plane;
  /** Histograms of each photo's normalised luminance. */
  histograms: Partial<Record<PhotoRole, LuminanceHistogram>>;
}
