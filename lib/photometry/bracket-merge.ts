import { exposureFactor } from './exposure';
import { assertRaster, luminanceTables } from './raster';
import type { ExposureTags, PhotoRaster } from './types';

/** One photo of a bracket: the pixels and the settings it was taken with. */
export interface BracketMember {
  raster: PhotoRaster;
  exposure?: ExposureTags | null;
}

export interface BracketMergeOptions {
  /**
   * Linear level (0..1 of full scale, brightest channel) below which a sample is read noise and
   * quantisation rather than light. 1% keeps an 8-bit JPEG's lowest codes out (common practice).
   */
  noiseFloor?: number;
}

/** How a bracket was merged: what the reading reports about it. */
export interface BracketSummary {
  count: number;
  /** Index of the member whose exposure the merged values are on. */
  reference: number;
  /** E = t·S/N² of each member, in the order given. */
  exposures: number[];
  /** Brightest over darkest measured luminance (99.9th over 0.1st percentile of the usable pixels). */
  dynamicRange: number | null;
  /** The same in photographic stops (log2). */
  stops: number | null;
  /** Share of pixels clipped in every member (kept clipped in the merge, so the reading warns). */
  clippedEverywhere: number;
  /** Share of pixels under the noise floor in every member (taken from the longest exposure). */
  noiseEverywhere: number;
}

export interface MergedBracket {
  /** 16-bit linear raster; its linear value × `gain` is the luminance on the reference member's exposure. */
  raster: PhotoRaster;
  gain: number;
  /** The reference member's tags: the merged photo stands in for it. */
  exposure: ExposureTags | null;
  summary: BracketSummary;
}

const FULL = 65535;
// headroom under the 98% clipping threshold, so only pixels clipped in every member read as clipped
const TOP = 0.95;

/**
 * Merges photos of one view at different exposures into one linear plane on the first member's
 * exposure: each sample is scaled by E_ref/E_i, weighted by its exposure and by how well exposed it
 * is, and dropped when clipped (any channel ≥ 98% of full scale) or under the noise floor.
 */
export function mergeBracket(members: readonly BracketMember[], options: BracketMergeOptions = {}): MergedBracket {
  if (members.length === 0) throw new RangeError('a bracket needs at least one photo');
  const noiseFloor = options.noiseFloor ?? 0.01;
  if (!(noiseFloor >= 0 && noiseFloor < 0.5)) throw new RangeError(`noiseFloor must be in [0, 0.5), got ${noiseFloor}`);
  const first = (members[0] as BracketMember).raster;
  for (const m of members) {
    assertRaster(m.raster);
    if (m.raster.width !== first.width || m.raster.height !== first.height) {
      throw new RangeError(`bracket photos differ in size: ${m.raster.width} × ${m.raster.height} against ${first.width} × ${first.height}`);
    }
  }
  const exposures = members.map((m, i) => {
    const e = exposureFactor(m.exposure);
    if (e === null) throw new RangeError(`bracket photo ${i + 1} has no exposure time, f-number and ISO: a bracket cannot be merged without them`);
    return e;
  });
  const eRef = exposures[0] as number;
  const { width, height } = first;
  const n = width * height;
  const channels: 1 | 3 = members.every((m) => m.raster.channels === 1) ? 1 : 3;
  const merged = new Float64Array(n * channels);
  const clippedAll = new Uint8Array(n);
  let noiseAll = 0;
  let clipAll = 0;
  // longest exposure first: where every sample is under the floor it is still the best estimate
  const longest = exposures.indexOf(Math.max(...exposures));
  const shortest = exposures.indexOf(Math.min(...exposures));
  const tables = members.map((m) => luminanceTables(m.raster.bitDepth, m.raster.encoding));
  const usable = new Float64Array(n);
  const wsum = new Float64Array(n);
  for (let k = 0; k < members.length; k++) {
    const { data, channels: ch } = (members[k] as BracketMember).raster;
    const { linear, clipCode } = tables[k] as ReturnType<typeof luminanceTables>;
    const maxCode = linear.length - 1;
    // scale to the reference exposure: linear signal ∝ L·t·S/N² (ISO 12232)
    const toRef = eRef / (exposures[k] as number);
    const e = exposures[k] as number;
    for (let i = 0; i < n; i++) {
      const p = i * ch;
      const r = data[p] as number;
      const g = ch === 3 ? (data[p + 1] as number) : r;
      const b = ch === 3 ? (data[p + 2] as number) : r;
      if (r >= clipCode || g >= clipCode || b >= clipCode) continue;
      const top = Math.max(r, g, b);
      if ((linear[top] as number) < noiseFloor) continue;
      // hat on the brightest code: full weight mid-scale, tapering towards the clip and the floor
      const x = top / maxCode;
      const hat = 1 - Math.pow(2 * x - 1, 12);
      const w = e * Math.max(hat, 1e-3);
      wsum[i] = (wsum[i] as number) + w;
      usable[i] = 1;
      if (channels === 3) {
        const q = 3 * i;
        merged[q] = (merged[q] as number) + w * (linear[r] as number) * toRef;
        merged[q + 1] = (merged[q + 1] as number) + w * (linear[g] as number) * toRef;
        merged[q + 2] = (merged[q + 2] as number) + w * (linear[b] as number) * toRef;
      } else {
        merged[i] = (merged[i] as number) + w * (linear[r] as number) * toRef;
      }
    }
  }
  for (let i = 0; i < n; i++) {
    const w = wsum[i] as number;
    if (w > 0) {
      for (let c = 0; c < channels; c++) merged[i * channels + c] = (merged[i * channels + c] as number) / w;
      continue;
    }
    // no usable sample: clipped in the shortest exposure → clipped; otherwise dark → longest exposure
    const shortRaster = (members[shortest] as BracketMember).raster;
    const st = tables[shortest] as ReturnType<typeof luminanceTables>;
    const sp = i * shortRaster.channels;
    const sr = shortRaster.data[sp] as number;
    const sg = shortRaster.channels === 3 ? (shortRaster.data[sp + 1] as number) : sr;
    const sb = shortRaster.channels === 3 ? (shortRaster.data[sp + 2] as number) : sr;
    if (sr >= st.clipCode || sg >= st.clipCode || sb >= st.clipCode) {
      clippedAll[i] = 1;
      clipAll++;
      continue;
    }
    noiseAll++;
    const lr = (members[longest] as BracketMember).raster;
    const lt = tables[longest] as ReturnType<typeof luminanceTables>;
    const toRef = eRef / (exposures[longest] as number);
    const lp = i * lr.channels;
    for (let c = 0; c < channels; c++) {
      const code = lr.data[lp + (lr.channels === 3 ? c : 0)] as number;
      merged[i * channels + c] = (lt.linear[code] as number) * toRef;
    }
  }
  let peak = 0;
  for (let i = 0; i < n; i++) {
    if (clippedAll[i]) continue;
    for (let c = 0; c < channels; c++) peak = Math.max(peak, merged[i * channels + c] as number);
  }
  const gain = peak > 0 ? peak / TOP : 1;
  const out = new Uint16Array(n * channels);
  const inv = FULL / gain;
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < channels; c++) {
      const q = i * channels + c;
      out[q] = clippedAll[i] ? FULL : Math.min(FULL, Math.max(0, Math.round((merged[q] as number) * inv)));
    }
  }

  // dynamic range over a subsample of the pixels that had a usable sample
  const step = Math.max(1, Math.floor(n / 200_000));
  const ys: number[] = [];
  for (let i = 0; i < n; i += step) {
    if (!usable[i]) continue;
    const q = i * channels;
    // ITU-R BT.709 luminance weights on linear values
    const y = channels === 3 ? 0.2126 * (merged[q] as number) + 0.7152 * (merged[q + 1] as number) + 0.0722 * (merged[q + 2] as number) : (merged[q] as number);
    if (y > 0) ys.push(y);
  }
  ys.sort((a, b) => a - b);
  let dynamicRange: number | null = null;
  if (ys.length >= 2) {
    const lo = ys[Math.floor(0.001 * (ys.length - 1))] as number;
    const hi = ys[Math.ceil(0.999 * (ys.length - 1))] as number;
    dynamicRange = lo > 0 ? hi / lo : null;
  }
  return {
    raster: { data: out, width, height, channels, bitDepth: 16, encoding: 'linear' },
    gain,
    exposure: members[0]?.exposure ?? null,
    summary: {
      count: members.length,
      reference: 0,
      exposures,
      dynamicRange,
      stops: dynamicRange === null ? null : Math.log2(dynamicRange),
      clippedEverywhere: clipAll / n,
      noiseEverywhere: noiseAll / n,
    },
  };
}
