/**
 * What a file says about how its values encode light, for the default of "read this 16-bit TIFF
 * as linear". The rule (shown to testers beside the setting):
 *
 * - Only a 16-bit TIFF can be linear; every other photo is read as sRGB-encoded.
 * - A 16-bit TIFF with an ICC colour profile follows the profile's tone curves: linear when they
 *   are straight lines (gamma 1.0, as in a "linear sRGB/Rec. 709" profile), gamma-encoded otherwise
 *   (sRGB, Adobe RGB, ProPhoto and every other profile with a curve). An unreadable profile counts
 *   as gamma-encoded, the engine's safe old reading.
 * - Without a profile, a TIFF TransferFunction tag (301) decides the same way.
 * - With neither, the TIFF is taken as linear: that is what raw converters write when asked for
 *   linear 16-bit output without gamma, while editors exporting gamma-encoded 16-bit TIFFs embed
 *   their profile.
 *
 * ICC tone curves: ICC.1:2010 §10.6 (curveType) and §10.18 (parametricCurveType); TIFF 6.0 §20
 * (TransferFunction). The tester can always override the default per capture set or per photo.
 */

export type TiffEncoding = 'linear' | 'srgb';
export type FileEncoding = { encoding: TiffEncoding; reason: string };

/** How far a tone curve may stray from the straight line and still count as linear (of full scale). */
const LINEAR_TOLERANCE = 0.01;
const SAMPLES = [0.02, 0.1, 0.25, 0.5, 0.75, 0.95];

const ascii = (b: Uint8Array, at: number, n: number): string => String.fromCharCode(...b.subarray(at, at + n));

type Curve = (x: number) => number;

/** The tone curve stored at `at` (a curv or para element), or null when it is neither. */
function readCurve(icc: Uint8Array, at: number, size: number): Curve | null {
  if (at < 0 || at + 12 > icc.length || size < 12) return null;
  const v = new DataView(icc.buffer, icc.byteOffset, icc.byteLength);
  const sig = ascii(icc, at, 4);
  if (sig === 'curv') {
    const n = v.getUint32(at + 8);
    if (n === 0) return (x) => x;
    if (n === 1) {
      const g = v.getUint16(at + 12) / 256;
      return (x) => x ** g;
    }
    if (at + 12 + 2 * n > icc.length) return null;
    const table = Array.from({ length: n }, (_, k) => v.getUint16(at + 12 + 2 * k) / 65535);
    return (x) => {
      const t = x * (n - 1);
      const k = Math.min(n - 2, Math.floor(t));
      return (table[k] as number) + ((table[k + 1] as number) - (table[k] as number)) * (t - k);
    };
  }
  if (sig === 'para') {
    const type = v.getUint16(at + 8);
    const count = [1, 3, 4, 5, 7][type];
    if (count === undefined || at + 12 + 4 * count > icc.length) return null;
    const p = Array.from({ length: count }, (_, k) => v.getInt32(at + 12 + 4 * k) / 65536);
    const [g = 1, a = 1, b = 0, c = 0, d = 0, e = 0, f = 0] = p;
    if (type === 0) return (x) => x ** g;
    if (type === 1) return (x) => (x >= -b / a ? (a * x + b) ** g : 0);
    if (type === 2) return (x) => (x >= -b / a ? (a * x + b) ** g + c : c);
    if (type === 3) return (x) => (x >= d ? (a * x + b) ** g : c * x);
    return (x) => (x >= d ? (a * x + b) ** g + e : c * x + f);
  }
  return null;
}

const isStraight = (curve: Curve): boolean => SAMPLES.every((x) => Math.abs(curve(x) - x) <= LINEAR_TOLERANCE);

/** The profile's description, for the reason shown to the tester ('' when it has none we can read). */
function description(icc: Uint8Array, at: number, size: number): string {
  if (at + 12 > icc.length || size < 12) return '';
  const v = new DataView(icc.buffer, icc.byteOffset, icc.byteLength);
  const sig = ascii(icc, at, 4);
  let text = '';
  if (sig === 'desc') {
    const n = v.getUint32(at + 8);
    text = ascii(icc, at + 12, Math.min(n, 200, icc.length - at - 12));
  } else if (sig === 'mluc' && at + 28 <= icc.length) {
    const length = v.getUint32(at + 20);
    const offset = v.getUint32(at + 24);
    const chars: number[] = [];
    for (let k = 0; k + 1 < Math.min(length, 400) && at + offset + k + 1 < icc.length; k += 2) chars.push(v.getUint16(at + offset + k));
    text = String.fromCharCode(...chars);
  }
  return text.replace(/[\u0000-\u001f\u007f]/g, '').trim().slice(0, 80);
}

/** Reads an ICC profile's tone curves: linear, gamma-encoded, or null when the profile cannot be read. */
export function iccEncoding(icc: Uint8Array): FileEncoding | null {
  if (icc.length < 132 || ascii(icc, 36, 4) !== 'acsp') return null;
  const v = new DataView(icc.buffer, icc.byteOffset, icc.byteLength);
  const count = v.getUint32(128);
  if (count > 200 || 132 + 12 * count > icc.length) return null;
  const tags = new Map<string, [number, number]>();
  for (let k = 0; k < count; k++) {
    const e = 132 + 12 * k;
    tags.set(ascii(icc, e, 4), [v.getUint32(e + 4), v.getUint32(e + 8)]);
  }
  const names = tags.has('rTRC') ? ['rTRC', 'gTRC', 'bTRC'] : tags.has('kTRC') ? ['kTRC'] : [];
  if (names.length === 0) return null;
  const curves = names.map((n) => {
    const [at, size] = tags.get(n) ?? [-1, 0];
    return readCurve(icc, at, size);
  });
  if (curves.some((c) => c === null)) return null;
  const desc = tags.has('desc') ? description(icc, ...(tags.get('desc') as [number, number])) : '';
  const named = desc ? `colour profile “${desc}”` : 'colour profile';
  return (curves as Curve[]).every(isStraight)
    ? { encoding: 'linear', reason: `${named} with linear tone curves (gamma 1.0)` }
    : { encoding: 'srgb', reason: `${named} with a gamma tone curve` };
}

/** The TransferFunction (tag 301) of a TIFF's first page: linear, gamma, or null when it has none. */
export function tiffTransferEncoding(buf: Uint8Array): FileEncoding | null {
  if (buf.length < 16) return null;
  const little = buf[0] === 0x49 && buf[1] === 0x49;
  if (!little && !(buf[0] === 0x4d && buf[1] === 0x4d)) return null;
  const v = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
  const ifd = v.getUint32(4, little);
  if (ifd + 2 > buf.length) return null;
  const n = v.getUint16(ifd, little);
  for (let k = 0; k < n; k++) {
    const e = ifd + 2 + 12 * k;
    if (e + 12 > buf.length) return null;
    if (v.getUint16(e, little) !== 301 || v.getUint16(e + 2, little) !== 3) continue;
    const count = v.getUint32(e + 4, little);
    const at = v.getUint32(e + 8, little);
    // one curve (or the first of three) of 2^bits entries
    const per = count % 3 === 0 && count > 3 ? count / 3 : count;
    if (per < 2 || at + 2 * per > buf.length) return null;
    const curve: Curve = (x) => v.getUint16(at + 2 * Math.round(x * (per - 1)), little) / 65535;
    return isStraight(curve) ? { encoding: 'linear', reason: 'TIFF transfer function is linear' } : { encoding: 'srgb', reason: 'TIFF transfer function with a gamma curve' };
  }
  return null;
}

/**
 * The encoding a photo's file declares (see the rule at the top): `format` and `sixteen` as sharp's
 * metadata reports them, `icc` the embedded profile if any, `bytes` the file.
 */
export function encodingFromFile(o: { format: string; sixteen: boolean; icc?: Uint8Array | null; bytes: Uint8Array }): FileEncoding {
  if (o.format !== 'tiff' || !o.sixteen) return { encoding: 'srgb', reason: o.sixteen ? '16-bit, but not a TIFF' : '8-bit photo' };
  if (o.icc && o.icc.length > 0) return iccEncoding(o.icc) ?? { encoding: 'srgb', reason: 'colour profile that cannot be read' };
  return tiffTransferEncoding(o.bytes) ?? { encoding: 'linear', reason: 'no colour profile, as raw converters write linear output' };
}
