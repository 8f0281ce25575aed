export interface LuminanceHistogram {
  /** Bin edges are 2^log2Min … 2^log2Max in equal log2 steps. */
  log2Min: number;
  log2Max: number;
  counts: number[];
  /** Values at or below zero (no light, or noise below black). */
  nonPositive: number;
  /** Values above the top edge. */
  above: number;
  total: number;
  /** Every step-th pixel was counted. */
  step: number;
}

/** Histogram of luminance in log2 bins (stops), the scale on which exposure and contrast read naturally. */
export function luminanceHistogram(values: ArrayLike<number>, bins = 96, log2Min = -14, log2Max = 2, step = 1): LuminanceHistogram {
  if (!Number.isInteger(step) || step < 1) throw new RangeError('step must be a positive integer');
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError('bins must be a positive integer');
  if (!(log2Max > log2Min)) throw new RangeError('log2Max must exceed log2Min');
  const counts = new Array<number>(bins).fill(0);
  if (values instanceof Float32Array) return float32Histogram(values, bins, log2Min, log2Max, step, counts);
  let nonPositive = 0;
  let above = 0;
  let total = 0;
  const scale = bins / (log2Max - log2Min);
  for (let i = 0; i < values.length; i += step) {
    const v = values[i] as number;
    if (v !== v) continue;
    total++;
    if (v <= 0) { nonPositive++; continue; }
    const k = binOf(v, log2Min, scale);
    if (k >= bins) above++;
    else { const b = Math.max(0, k); counts[b] = (counts[b] as number) + 1; }
  }
  return { log2Min, log2Max, counts, nonPositive, above, total, step };
}

/** The bin a positive value falls in, before clamping: ⌊(log2 v − log2Min) · bins per stop⌋. */
function binOf(v: number, log2Min: number, scale: number): number {
  return Math.floor((Math.log2(v) - log2Min) * scale);
}

const F32_INFINITY_BITS = 0x7f800000;

interface BinEdges {
  /** edges[j] = the bit pattern of the smallest positive float32 whose bin is ≥ j + 1 (j = bins − 1: above the top). */
  edges: Uint32Array;
  /** byPrefix[h] = the clamped bin (0 … bins) of the float32 with bits h << 16. */
  byPrefix: Uint8Array | Uint16Array;
}

const edgeCache = new Map<string, BinEdges>();
const f32 = new Float32Array(1);
const f32Bits = new Uint32Array(f32.buffer);

function valueOfBits(bits: number): number {
  f32Bits[0] = bits;
  return f32[0] as number;
}

/**
 * The float32 bit patterns where the bin changes. For positive float32 values the bin is a
 * non-decreasing function of the bit pattern (log2 is increasing and adjacent float32 values are far
 * apart next to its rounding error; subtraction, product and floor keep the order), so a binary
 * search over bit patterns finds each edge of binOf exactly.
 */
function binEdges(bins: number, log2Min: number, log2Max: number): BinEdges {
  const key = `${bins}:${log2Min}:${log2Max}`;
  const hit = edgeCache.get(key);
  if (hit) return hit;
  const scale = bins / (log2Max - log2Min);
  const edges = new Uint32Array(bins);
  for (let j = 0; j < bins; j++) {
    // smallest bits in [1, +∞] with binOf ≥ j + 1 (+∞ always qualifies)
    let lo = 1;
    let hi = F32_INFINITY_BITS;
    while (lo < hi) {
      const mid = lo + Math.floor((hi - lo) / 2);
      if (binOf(valueOfBits(mid), log2Min, scale) >= j + 1) hi = mid;
      else lo = mid + 1;
    }
    edges[j] = lo;
  }
  const prefixes = (F32_INFINITY_BITS >>> 16) + 1;
  const byPrefix = bins < 256 ? new Uint8Array(prefixes) : new Uint16Array(prefixes);
  for (let h = 0, c = 0; h < prefixes; h++) {
    const bits = h * 65536;
    while (c < bins && bits >= (edges[c] as number)) c++;
    byPrefix[h] = c;
  }
  const found = { edges, byPrefix };
  edgeCache.set(key, found);
  return found;
}

/** The same counts as the general loop, from each value's float32 bits: a table on the top 16 bits, then at most a step or two. */
function float32Histogram(values: Float32Array, bins: number, log2Min: number, log2Max: number, step: number, counts: number[]): LuminanceHistogram {
  const { edges, byPrefix } = binEdges(bins, log2Min, log2Max);
  const bits = new Uint32Array(values.buffer, values.byteOffset, values.length);
  const tally = new Float64Array(bins + 1);
  let nonPositive = 0;
  let total = 0;
  for (let i = 0; i < bits.length; i += step) {
    const u = bits[i] as number;
    // NaN: all exponent bits set and a non-zero fraction, either sign
    if ((u & 0x7fffffff) > F32_INFINITY_BITS) continue;
    total++;
    // zero, negative zero and every negative value
    if (u === 0 || u >= 0x80000000) {
      nonPositive++;
      continue;
    }
    let c = byPrefix[u >>> 16] as number;
    while (c < bins && u >= (edges[c] as number)) c++;
    tally[c] = (tally[c] as number) + 1;
  }
  for (let b = 0; b < bins; b++) counts[b] = tally[b] as number;
  return { log2Min, log2Max, counts, nonPositive, above: tally[bins] as number, total, step };
}
