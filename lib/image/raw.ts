/**
 * Camera raw photos: recognising them by content, and decoding them to linear 16-bit RGB with
 * Debian's libraw tools (package libraw-bin: `raw-identify`, `dcraw_emu`).
 *
 * The rules (docs/method.md §5.1, shown to testers in the README):
 *
 * - **Linear, nothing automatic.** `dcraw_emu -4`: 16-bit output, gamma 1 (linear), no automatic
 *   brightening, the file's own white level kept (`-c 0`: libraw would otherwise lower it to a bright
 *   photo's own maximum, scaling that photo alone); highlights clipped (`-H 0`), AHD demosaicing (`-q 3`), sRGB primaries (`-o 1`)
 *   through the camera's colour matrix (the DNG's ColorMatrix, or libraw's table for a maker's
 *   format). The engine then reads the values as linear light, like a linear 16-bit TIFF.
 * - **One fixed white balance per capture set, never automatic.** Every raw photo of a set is decoded
 *   with the same channel multipliers (`-r`): the camera's D65 daylight multipliers, which libraw
 *   derives from the camera's colour matrix (not from the shot), read from the first raw photo of
 *   the set (the on photo, or the first of its bracket). The as-shot multipliers a camera writes
 *   depend on its white-balance setting and, on auto, on the scene (a bright display changes them
 *   between the on and off photos), so they are never used. When libraw knows no colour data for the
 *   camera, unity multipliers (1, 1, 1, 1) are used for every photo instead, and the reading says so.
 * - **Exposure tags from the raw itself**: ISO, shutter and aperture as raw-identify reads them,
 *   into the same ExposureTags the engine uses for any photo.
 * - **Contained**: the tools run without a shell (arguments passed as a list), in a private temporary
 *   folder (mode 0700) removed afterwards, under a time limit, on an input whose size is checked
 *   before anything is decoded (bytes, then pixels from the header). A failed decode is an
 *   EngineInputError with one line to act on.
 */
import { spawn } from 'node:child_process';
import { mkdtemp, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { EngineInputError } from '../photometry/errors';
import type { ExposureTags, PhotoRaster } from '../photometry/types';
import { EXIF_BOUNDS, exifText, withinBounds } from './exif';
import { RAW_TYPES, type RawKind } from './raw-formats';

export { isRawFormat, RAW_ACCEPT, RAW_KINDS, RAW_LIST, RAW_TYPES, type RawKind } from './raw-formats';

/** Largest raw file decoded (the web upload's own limit is lower; this bounds the CLI). */
export const MAX_RAW_BYTES = 200 * 1024 * 1024;
/** Largest photo decoded, as for every photo (docs/method.md §5.1). */
const MAX_RAW_PIXELS = 100_000_000;
/** Time limits: reading the header, a half-size preview, the full linear decode. */
const IDENTIFY_MS = 20_000;
const PREVIEW_MS = 60_000;
const DECODE_MS = 240_000;
/** What a tool may print before it is stopped (the header listing is a few kilobytes). */
const MAX_TOOL_OUTPUT = 1024 * 1024;

// ---------------------------------------------------------------------------------------------------
// Recognising a raw file by its content

const ascii = (b: Uint8Array, at: number, n: number): string => (at + n <= b.length ? String.fromCharCode(...b.subarray(at, at + n)) : '');

type TiffFacts = { make: string; dng: boolean; cfa: boolean };

// Compression codes used only for raw sensor data (TIFF/EP and makers' own): 32767 Sony, 32769,
// 32770, 32772, 32773 Samsung and others, 34713 Nikon, 65535 Pentax, 34892 lossy DNG.
const RAW_COMPRESSIONS = new Set([32767, 32769, 32770, 32772, 32773, 34713, 34892, 65535]);
// PhotometricInterpretation of sensor data: 32803 CFA (TIFF/EP), 34892 LinearRaw (DNG)
const RAW_PHOTOMETRIC = new Set([32803, 34892]);

/** What a TIFF-structured file's IFDs say: its Make, a DNGVersion, sensor (CFA) data. Null when it is no TIFF. */
export function tiffFacts(b: Uint8Array): TiffFacts | null {
  if (b.length < 16) return null;
  const little = b[0] === 0x49 && b[1] === 0x49;
  const big = b[0] === 0x4d && b[1] === 0x4d;
  if (!little && !big) return null;
  const v = new DataView(b.buffer, b.byteOffset, b.byteLength);
  const u16 = (o: number): number => (o + 2 <= b.length ? v.getUint16(o, little) : 0);
  const u32 = (o: number): number => (o + 4 <= b.length ? v.getUint32(o, little) : 0);
  const facts: TiffFacts = { make: '', dng: false, cfa: false };
  const seen = new Set<number>();
  const queue: number[] = [u32(4)];
  // IFD0, the chain after it and their SubIFDs; a few dozen at most, each visited once
  while (queue.length > 0 && seen.size < 32) {
    const at = queue.shift() as number;
    if (at < 8 || at + 2 > b.length || seen.has(at)) continue;
    seen.add(at);
    const n = u16(at);
    if (n > 1000) continue;
    for (let k = 0; k < n; k++) {
      const e = at + 2 + 12 * k;
      if (e + 12 > b.length) break;
      const tag = u16(e);
      const type = u16(e + 2);
      const count = u32(e + 4);
      const short = type === 3 ? u16(e + 8) : u32(e + 8);
      if (tag === 0xc612) facts.dng = true;
      else if (tag === 262 && RAW_PHOTOMETRIC.has(short)) facts.cfa = true;
      else if (tag === 259 && RAW_COMPRESSIONS.has(short)) facts.cfa = true;
      else if (tag === 271 && type === 2 && !facts.make) {
        const where = count <= 4 ? e + 8 : u32(e + 8);
        facts.make = ascii(b, where, Math.min(count, 64)).replace(/\0.*$/s, '').trim().toUpperCase();
      } else if (tag === 330) {
        if (count === 1) queue.push(u32(e + 8));
        else for (let j = 0; j < Math.min(count, 8); j++) queue.push(u32(u32(e + 8) + 4 * j));
      }
    }
    const next = u32(at + 2 + 12 * n);
    if (next) queue.push(next);
  }
  return facts;
}

const MAKER_KINDS: [RegExp, RawKind][] = [
  [/^NIKON/, 'nef'],
  [/^SONY/, 'arw'],
  [/^(PENTAX|RICOH)/, 'pef'],
  [/^SAMSUNG/, 'srw'],
  [/^CANON/, 'cr2'],
  [/^(OLYMPUS|OM DIGITAL)/, 'orf'],
  [/^(PANASONIC|LEICA)/, 'rw2'],
  [/^FUJIFILM/, 'raf'],
];

/**
 * The raw format of a file, from its content: the ISO media brand of CR3, the signatures of RAF,
 * ORF and RW2, the 'CR' mark of CR2, a DNGVersion tag, or sensor (CFA) data in a TIFF structure
 * with the maker's Make (NEF, ARW, PEF, SRW). A TIFF structure of a known maker without CFA tags
 * counts when the name carries that maker's raw extension. Null for anything else.
 */
export function sniffRaw(b: Uint8Array, name = ''): RawKind | null {
  if (b.length < 16) return null;
  if (ascii(b, 4, 8) === 'ftypcrx ') return 'cr3';
  if (ascii(b, 0, 15) === 'FUJIFILMCCD-RAW') return 'raf';
  const head = ascii(b, 0, 4);
  if (head === 'IIRO' || head === 'IIRS' || head === 'MMOR') return 'orf';
  if (head === 'IIU\0') return 'rw2';
  const facts = tiffFacts(b);
  if (!facts) return null;
  if (ascii(b, 8, 2) === 'CR' && head === 'II*\0') return 'cr2';
  if (facts.dng) return 'dng';
  const byMaker = MAKER_KINDS.find(([re]) => re.test(facts.make))?.[1] ?? null;
  if (facts.cfa && byMaker) return byMaker;
  const ext = name.toLowerCase().split('.').pop() ?? '';
  if (byMaker && ext === byMaker) return byMaker;
  return null;
}

/** True when a TIFF-structured file holds sensor data of a maker or format not accepted. */
export function isOtherRawTiff(b: Uint8Array): boolean {
  const facts = tiffFacts(b);
  return facts !== null && facts.cfa && !facts.dng;
}

// ---------------------------------------------------------------------------------------------------
// Running the tools

const MISSING_TOOLS = `camera raw photos need the libraw tools on the server (Debian package libraw-bin: dcraw_emu and raw-identify), which are not installed: ask the admin to install them (npm start installs them when missing), or export the photo as 16-bit TIFF`;

// the tools get a fixed environment: none of the server's settings or secrets, the C locale for their numbers
const TOOL_ENV = { PATH: '/usr/local/bin:/usr/bin:/bin', LANG: 'C', LC_ALL: 'C' } as unknown as NodeJS.ProcessEnv;

type ToolResult = { stdout: string; stderr: string; timedOut: boolean };

/** Runs a libraw tool without a shell, in `cwd`, stopping it after `ms` or when it prints too much. */
function runTool(tool: 'raw-identify' | 'dcraw_emu', args: string[], cwd: string, ms: number): Promise<ToolResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(tool, args, { cwd, shell: false, stdio: ['ignore', 'pipe', 'pipe'], env: TOOL_ENV });
    let out = '';
    let err = '';
    let timedOut = false;
    const stop = (): void => {
      child.kill('SIGKILL');
    };
    const timer = setTimeout(() => {
      timedOut = true;
      stop();
    }, ms);
    child.stdout.on('data', (d: Buffer) => {
      out += d.toString('latin1');
      if (out.length > MAX_TOOL_OUTPUT) stop();
    });
    child.stderr.on('data', (d: Buffer) => {
      err += d.toString('latin1');
      if (err.length > MAX_TOOL_OUTPUT) stop();
    });
    child.on('error', (e: NodeJS.ErrnoException) => {
      clearTimeout(timer);
      reject(e.code === 'ENOENT' ? new EngineInputError('unsupported-format', MISSING_TOOLS) : e);
    });
    child.on('close', () => {
      clearTimeout(timer);
      resolve({ stdout: out, stderr: err, timedOut });
    });
  });
}

/** Writes the file into a fresh private folder, runs `work` there, and removes the folder whatever happens. */
async function inPrivateFolder<T>(bytes: Uint8Array, kind: RawKind, work: (dir: string, input: string) => Promise<T>): Promise<T> {
  const dir = await mkdtemp(join(tmpdir(), 'veilmeter-raw-'));
  try {
    const input = join(dir, `photo.${RAW_TYPES[kind].ext}`);
    await writeFile(input, bytes, { mode: 0o600 });
    return await work(dir, input);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

function refuseOversize(bytes: Uint8Array, name: string, kind: RawKind): void {
  if (bytes.length > MAX_RAW_BYTES) {
    throw new EngineInputError('too-large', `${name} is a ${RAW_TYPES[kind].label} file of ${Math.round(bytes.length / 1048576)} MB, more than the ${MAX_RAW_BYTES / 1048576} MB a raw photo may have: crop it to the eyepiece view in a raw converter and save it as DNG`);
  }
}

// the tool's own words are kept out of messages (they name our temporary file); the gist is kept
function toolTrouble(stderr: string): string {
  if (/end of file|input\/output error|corrupt/i.test(stderr)) return 'its image data is damaged or cut short';
  if (/unsupported|not raw/i.test(stderr)) return 'libraw does not recognise it as a camera raw photo';
  if (/out of memory|too big|too large/i.test(stderr)) return 'it is too large to decode';
  return 'the raw decoder could not read it';
}

// ---------------------------------------------------------------------------------------------------
// The header: size, camera, exposure and the camera's daylight white balance

export interface RawInfo {
  kind: RawKind;
  /** Size of the decoded photo (after the camera's orientation). */
  width: number;
  height: number;
  make?: string;
  model?: string;
  exposure: ExposureTags | null;
  /** The camera's D65 daylight multipliers (R, G, B, G2) from its colour data; null when libraw has none. */
  daylight: [number, number, number, number] | null;
  /** EXIF orientation of the decoded result relative to the sensor (libraw applies it). */
  flip: number;
}

const line = (text: string, re: RegExp): string | undefined => re.exec(text)?.[1];

/** Reads the text raw-identify prints (`-v` listing and `-s` size line) into a RawInfo. Exported for tests. */
export function parseIdentify(kind: RawKind, verbose: string, sizes: string): RawInfo | null {
  const fields = sizes.trim().split('\n')[0]?.split('\t') ?? [];
  const [, make = '', model = ''] = fields;
  // the decoder's output size, turned when the camera's orientation is a quarter turn (flip 5 or 6,
  // bit 4 set); some libraw versions print "Output size" already turned, others not: compared with
  // the sensor's "Image size", a long side running the other way says it is turned already
  const img = /^Image size:\s*(\d+)\s*x\s*(\d+)/m.exec(verbose);
  const out = /^Output size:\s*(\d+)\s*x\s*(\d+)/m.exec(verbose) ?? img;
  if (!out) return null;
  const flipText = line(verbose, /^Image flip:\s*(\d+)/m);
  const flip = flipText === undefined ? 0 : Number(flipText);
  const [ow, oh] = [Number(out[1]), Number(out[2])];
  const turned = img !== null && ow !== oh && ow > oh !== Number(img[1]) > Number(img[2]);
  const quarter = (flip & 4) !== 0 && !turned;
  const width = quarter ? oh : ow;
  const height = quarter ? ow : oh;
  if (!(width > 0 && height > 0)) return null;
  const exposure: ExposureTags = {};
  const iso = Number(line(verbose, /^ISO speed:\s*([\d.]+)/m));
  const shutter = /^Shutter:\s*(?:1\/([\d.]+)|([\d.]+)\s*sec)/m.exec(verbose);
  const time = shutter ? (shutter[1] ? 1 / Number(shutter[1]) : Number(shutter[2])) : NaN;
  const aperture = Number(line(verbose, /^Aperture:\s*f\/([\d.]+)/m));
  if (withinBounds(time, EXIF_BOUNDS.exposureTime)) exposure.exposureTime = time;
  if (withinBounds(aperture, EXIF_BOUNDS.fNumber)) exposure.fNumber = aperture;
  if (withinBounds(iso, EXIF_BOUNDS.iso)) exposure.iso = iso;
  const m = exifText(make);
  const md = exifText(model);
  if (m) exposure.make = m;
  if (md) exposure.model = md;
  const mul = line(verbose, /^Derived D65 multipliers:[ \t]*([\d. \t]+)$/m)
    ?.trim()
    .split(/\s+/)
    .map(Number);
  let daylight: RawInfo['daylight'] = null;
  if (mul && mul.length >= 3 && mul.slice(0, 3).every((x) => Number.isFinite(x) && x > 0)) {
    const [r, g, b] = mul as [number, number, number];
    const g2 = mul[3] !== undefined && Number.isFinite(mul[3]) && mul[3] > 0 ? mul[3] : g;
    daylight = [r, g, b, g2];
  }
  return { kind, width, height, make: m, model: md, exposure: Object.keys(exposure).length > 0 ? exposure : null, daylight, flip };
}

async function identifyIn(dir: string, input: string, name: string, kind: RawKind): Promise<RawInfo> {
  const [verbose, sizes] = [await runTool('raw-identify', ['-v', input], dir, IDENTIFY_MS), await runTool('raw-identify', ['-s', input], dir, IDENTIFY_MS)];
  if (verbose.timedOut || sizes.timedOut) throw new EngineInputError('not-an-image', `${name}: reading its raw header took too long, so it was stopped: upload the original file from the camera again`);
  const failed = /Cannot (decode|open)/.test(verbose.stderr + sizes.stderr);
  const info = failed ? null : parseIdentify(kind, verbose.stdout, sizes.stdout);
  if (!info) throw new EngineInputError('not-an-image', `${name} has the signature of a ${RAW_TYPES[kind].label} file, but ${toolTrouble(verbose.stderr + sizes.stderr)}: upload the original file from the camera again, or convert it to DNG`);
  if (info.width < 16 || info.height < 16) throw new EngineInputError('not-an-image', `${name} is only ${info.width} × ${info.height} pixels: send the full camera photo`);
  if (info.width * info.height > MAX_RAW_PIXELS) {
    throw new EngineInputError('too-large', `${name} has ${Math.round((info.width * info.height) / 1e6)} megapixels (${info.width} × ${info.height}), more than 100: crop it to the eyepiece view in a raw converter and save it as DNG`);
  }
  return info;
}

/** Reads a raw file's header with raw-identify: size, camera, exposure tags, daylight multipliers. Decodes no pixels. */
export async function identifyRaw(bytes: Uint8Array, name: string, kind: RawKind): Promise<RawInfo> {
  refuseOversize(bytes, name, kind);
  return inPrivateFolder(bytes, kind, (dir, input) => identifyIn(dir, input, name, kind));
}

// ---------------------------------------------------------------------------------------------------
// White balance and decoding

/** The channel multipliers every raw photo of a set is decoded with, and where they came from. */
export interface RawWhiteBalance {
  multipliers: [number, number, number, number];
  source: 'daylight' | 'unity';
}

/** The set's fixed white balance from its first raw photo's header (see the rule at the top). */
export function setWhiteBalance(first: RawInfo): RawWhiteBalance {
  if (first.daylight) return { multipliers: first.daylight, source: 'daylight' };
  return { multipliers: [1, 1, 1, 1], source: 'unity' };
}

export interface DecodedRaw {
  raster: PhotoRaster;
  exposure: ExposureTags | null;
  info: RawInfo;
  whiteBalance: RawWhiteBalance;
}

/** A binary PPM (P6) of 8 or 16 bits (16-bit samples big-endian, Netpbm) as interleaved RGB. */
export function parsePpm(buf: Uint8Array): { data: Uint8Array | Uint16Array; width: number; height: number; sixteen: boolean } | null {
  // header: P6, width, height, maxval, each separated by whitespace, then one whitespace byte
  let at = 0;
  const tokens: string[] = [];
  while (tokens.length < 4 && at < Math.min(buf.length, 256)) {
    while (at < buf.length && /\s/.test(String.fromCharCode(buf[at] as number))) at++;
    if (buf[at] === 0x23) {
      while (at < buf.length && buf[at] !== 0x0a) at++;
      continue;
    }
    let t = '';
    while (at < buf.length && !/\s/.test(String.fromCharCode(buf[at] as number))) t += String.fromCharCode(buf[at++] as number);
    tokens.push(t);
  }
  at++;
  const [magic, w, h, max] = tokens;
  const width = Number(w);
  const height = Number(h);
  const maxval = Number(max);
  if (magic !== 'P6' || !(width > 0) || !(height > 0) || !(maxval > 0 && maxval < 65536)) return null;
  const sixteen = maxval > 255;
  const count = width * height * 3;
  if (buf.length - at < count * (sixteen ? 2 : 1)) return null;
  if (!sixteen) return { data: buf.subarray(at, at + count), width, height, sixteen };
  // one copy into an aligned array, then the bytes of each sample swapped in place (native, fast)
  const data = new Uint16Array(count);
  const bytes = Buffer.from(data.buffer, data.byteOffset, data.byteLength);
  bytes.set(buf.subarray(at, at + count * 2));
  if (new Uint8Array(new Uint16Array([1]).buffer)[0] === 1) bytes.swap16();
  return { data, width, height, sixteen };
}

function decodeArgs(input: string, output: string, wb: RawWhiteBalance, half: boolean): string[] {
  const mul = wb.multipliers.map((m) => m.toFixed(6));
  // -4: 16-bit, gamma 1 (linear), no automatic brightening; the preview keeps the 8-bit sRGB curve.
  // -c 0: the saturation level stays the file's own white level (libraw otherwise lowers it to the
  // brightest value in a photo whose data come near it, which scales that one photo alone)
  const tone = half ? ['-h'] : ['-4', '-q', '3'];
  return [...tone, '-c', '0', '-H', '0', '-o', '1', '-r', ...mul, '-Z', output, input];
}

async function decodeIn(dir: string, input: string, name: string, info: RawInfo, wb: RawWhiteBalance, half: boolean, onStarted?: () => void): Promise<{ data: Uint8Array | Uint16Array; width: number; height: number }> {
  const output = join(dir, 'decoded.ppm');
  const running = runTool('dcraw_emu', decodeArgs(input, output, wb, half), dir, half ? PREVIEW_MS : DECODE_MS);
  onStarted?.();
  const r = await running;
  if (r.timedOut) throw new EngineInputError('too-large', `${name}: decoding the ${RAW_TYPES[info.kind].label} file took longer than ${Math.round((half ? PREVIEW_MS : DECODE_MS) / 1000)} s, so it was stopped: crop it in a raw converter and save it as DNG, or export a 16-bit TIFF`);
  const size = await stat(output).then((s) => s.size, () => 0);
  const ppm = size > 0 && size <= 8 * MAX_RAW_PIXELS ? parsePpm(await readFile(output)) : null;
  if (!ppm || /Cannot|Unexpected end/i.test(r.stderr)) {
    throw new EngineInputError('not-an-image', `${name} could not be decoded as ${RAW_TYPES[info.kind].label}: ${toolTrouble(r.stderr)}. Upload the original file from the camera again, or convert it to DNG`);
  }
  return ppm;
}

/**
 * Decodes a raw photo to linear 16-bit RGB (sRGB primaries) with the set's fixed white balance
 * (`whiteBalance`; without it, this photo's own daylight multipliers, as for a set of one raw).
 */
export async function decodeRaw(bytes: Uint8Array, o: { name: string; kind: RawKind; whiteBalance?: RawWhiteBalance | null; onDecodeStarted?: () => void }): Promise<DecodedRaw> {
  refuseOversize(bytes, o.name, o.kind);
  return inPrivateFolder(bytes, o.kind, async (dir, input) => {
    const info = await identifyIn(dir, input, o.name, o.kind);
    const wb = o.whiteBalance ?? setWhiteBalance(info);
    const ppm = await decodeIn(dir, input, o.name, info, wb, false, o.onDecodeStarted);
    if (!(ppm.data instanceof Uint16Array)) throw new EngineInputError('not-an-image', `${o.name} could not be decoded to 16 bits`);
    const raster: PhotoRaster = { data: ppm.data, width: ppm.width, height: ppm.height, channels: 3, bitDepth: 16, encoding: 'linear' };
    return { raster, exposure: info.exposure, info, whiteBalance: wb };
  });
}

/** Header facts and an 8-bit sRGB half-size image of a raw photo, for the upload's checks and preview. */
export async function rawPreview(bytes: Uint8Array, name: string, kind: RawKind): Promise<{ info: RawInfo; rgb: Uint8Array; width: number; height: number }> {
  refuseOversize(bytes, name, kind);
  return inPrivateFolder(bytes, kind, async (dir, input) => {
    const info = await identifyIn(dir, input, name, kind);
    const ppm = await decodeIn(dir, input, name, info, setWhiteBalance(info), true);
    const rgb = ppm.data instanceof Uint8Array ? ppm.data : Uint8Array.from(ppm.data, (v) => v >> 8);
    return { info, rgb, width: ppm.width, height: ppm.height };
  });
}
