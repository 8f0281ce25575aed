// Guards shared by the statistics: a NaN among the readings must stop the comparison, not
// silently turn every figure into NaN.

export function assertFinite(name: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number (got ${String(value)})`);
  }
}

export function assertValues(values: ArrayLike<number>, min = 1): void {
  if (values.length < min) {
    throw new RangeError(`needs at least ${min} value${min === 1 ? '' : 's'} (got ${values.length})`);
  }
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw new RangeError(`value ${i} must be a finite number (got ${String(v)})`);
    }
  }
}

export function assertLevel(level: number): void {
  assertFinite('level', level);
  if (level <= 0 || level >= 1) throw new RangeError(`level must be between 0 and 1, exclusive (got ${level})`);
}
