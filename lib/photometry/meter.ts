/** Calibration constant of reflected-light meters most makers use (ISO 2720 allows 10.6–13.4). */
export const METER_K = 12.5;

/** Scene luminance in cd/m² that a reflected-light meter would set to these settings. */
export function meterLuminance(exposureTime: number, fNumber: number, iso: number, k = METER_K): number {
  for (const [name, v] of [['exposureTime', exposureTime], ['fNumber', fNumber], ['iso', iso], ['k', k]] as const) {
    if (!Number.isFinite(v) || v <= 0) throw new RangeError(`${name} must be a positive number, got ${v}`);
  }
  // ISO 2720:1974 reflected-light meter equation: N²/t = L·S/K
  return (k * fNumber * fNumber) / (exposureTime * iso);
}

/**
 * Share of full scale at which a metered mid-tone lands, used only for a rough cd/m² estimate:
 * 18% grey is the tone meters are built to reproduce (common practice).
 */
export const METERED_TONE = 0.18;
