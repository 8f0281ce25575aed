// Shared argument guards: every public optics function rejects bad input with a RangeError
// instead of quietly returning NaN into a budget.

export function assertFinite(name: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number (got ${String(value)})`);
  }
}

export function assertFraction(name: string, value: number): void {
  assertFinite(name, value);
  if (value < 0 || value > 1) {
    throw new RangeError(`${name} must be between 0 and 1 (got ${value})`);
  }
}

export function assertRange(name: string, value: number, min: number, max: number): void {
  assertFinite(name, value);
  if (value < min || value > max) {
    throw new RangeError(`${name} must be between ${min} and ${max} (got ${value})`);
  }
}

export function assertPositive(name: string, value: number): void {
  assertFinite(name, value);
  if (value <= 0) throw new RangeError(`${name} must be greater than 0 (got ${value})`);
}

/** Rounding slack for sums such as R + T that should not exceed 1. */
export const SUM_TOLERANCE = 1e-9;

export const DEG = Math.PI / 180;
