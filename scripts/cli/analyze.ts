// `veilmeter analyze`: the photometry engine on photos from disk, with the same readings the web app
// stores (docs/method.md §5). The help text below lists every option.
import { parseArgs } from 'node:util';
import { analyzeFiles, writeArtifacts } from '../../lib/image';
import { EngineInputError } from '../../lib/photometry/errors';
import type { BracketedResult } from '../../lib/photometry/analyze-capture';
import type { CaptureResult } from '../../lib/photometry/result';
import type { Offset, Pattern, Rect } from '../../lib/photometry/types';
import { EXIT_CODES, type Command } from './command';

function ints(name: string, text: string, count: number): number[] {
  const parts = text.split(',').map((s) => s.trim());
  const values = parts.map(Number);
  if (parts.length !== count || parts.some((p) => p === '') || !values.every(Number.isInteger)) {
    throw new EngineInputError('bad-argument', `--${name} needs ${count} whole numbers separated by commas, got "${text}"`);
  }
  return values;
}

function rect(name: string, text: string | undefined): Rect | null {
  if (text === undefined) return null;
  const [x, y, w, h] = ints(name, text, 4) as [number, number, number, number];
  return { x, y, w, h };
}

/** Two positive whole numbers "W×H" (or "W,H"), or null when the option is absent. */
function resolution(name: string, text: string | undefined): { width: number; height: number } | null {
  if (text === undefined) return null;
  const m = /^\s*(\d+)\s*[x×,]\s*(\d+)\s*$/i.exec(text);
  const width = m ? Number(m[1]) : Number.NaN;
  const height = m ? Number(m[2]) : Number.NaN;
  if (!(width >= 1 && height >= 1)) throw new EngineInputError('bad-argument', `--${name} needs the display's width and height in pixels as WxH, e.g. 1920x1080, got "${text}"`);
  return { width, height };
}

/** A chromaticity "x,y", or null when the option is absent. */
function chromaticityOption(name: string, text: string | undefined): { x: number; y: number } | null {
  if (text === undefined) return null;
  const parts = text.split(',').map((p) => Number(p.trim()));
  const [x, y] = parts as [number, number];
  if (parts.length !== 2 || !(x > 0 && y > 0 && x + y < 1)) throw new EngineInputError('bad-argument', `--${name} needs a chromaticity x,y with x > 0, y > 0 and x + y < 1, e.g. 0.3127,0.3290, got "${text}"`);
  return { x, y };
}

function fmt(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined) return '—';
  return Math.abs(v) >= 1000 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(3) : v.toFixed(digits);
}

function table(r: CaptureResult): string {
  const rows: [string, string][] = [
    ['engine', r.engineVersion],
    ['image', `${r.image.width} × ${r.image.height}`],
    ['pattern', r.pattern],
    ['screen', `${r.screen.x},${r.screen.y},${r.screen.w},${r.screen.h} (${r.screen.source})`],
    ['registration off', `${r.registration.off.dx},${r.registration.off.dy} px`],
    ['registration ambient', r.registration.ambient ? `${r.registration.ambient.dx},${r.registration.ambient.dy} px` : '—'],
    ['luminance on / off / ambient', `${fmt(r.luminance.on)} / ${fmt(r.luminance.off)} / ${fmt(r.luminance.ambient)} (relative)`],
    ['ambient contrast ratio', fmt(r.ambientContrastRatio, 3)],
    ['Michelson', fmt(r.michelson)],
    ['ANSI checkerboard contrast', fmt(r.ansiContrast, 2)],
    ['uniformity (min/max)', fmt(r.uniformity, 3)],
    ['ghost ratio', r.ghost ? `${(100 * r.ghost.ratio).toFixed(2)}% at ${r.ghost.dx},${r.ghost.dy} px (${r.ghost.source})` : 'none found'],
    ['transmission', r.transmission === null ? '—' : `${(100 * r.transmission).toFixed(1)}%`],
    // engine 1.2.0: the slope and intercept of off against ambient (docs/method.md §5.8), ± their standard uncertainty
    ['transmission of the optics', typeof r.transmissionOptics === 'number' ? `${(100 * r.transmissionOptics).toFixed(2)}% ± ${(100 * (r.uncertainty?.transmissionOptics ?? 0)).toFixed(2)}` : '—'],
    ['veil', r.veil ? `${(100 * r.veil.relative).toFixed(2)}% ± ${(100 * (r.uncertainty?.veil ?? 0)).toFixed(2)} of the room's luminance${r.veil.cdm2 === null ? '' : `, ${fmt(r.veil.cdm2, 2)} cd/m²`} (${r.veil.source})` : '—'],
    ['tint Δx, Δy / ΔE00', r.tint ? `${fmt(r.tint.dx, 4)}, ${fmt(r.tint.dy, 4)} / ${fmt(r.tint.deltaE00, 2)}` : '—'],
    ['clipped', `${(100 * r.clippedFraction).toFixed(3)}%`],
  ];
  if (r.sharpness) {
    const s = r.sharpness;
    rows.push(['MTF50', `${fmt(s.mtf50, 3)} cycles/pixel${s.mtf50PerDegree === null ? '' : ` · ${fmt(s.mtf50PerDegree, 2)} cycles/degree`} (edge at ${fmt(s.edgeAngle, 2)}°)`]);
  }
  if (r.geometry) {
    const g = r.geometry;
    rows.push(['field of view H / V / D', `${fmt(g.fovH, 2)}° / ${fmt(g.fovV, 2)}° / ${fmt(g.fovD, 2)}° (${fmt(g.degreesPerPixel, 5)}°/pixel, from ${g.source})`]);
    if (g.pixelsPerDegree !== null) rows.push(['display pixels per degree', fmt(g.pixelsPerDegree, 1)]);
  }
  if (r.displayColour) {
    const c = r.displayColour;
    rows.push(['display colour x, y / u′, v′', `${fmt(c.x)}, ${fmt(c.y)} / ${fmt(c.u)}, ${fmt(c.v)}`]);
    rows.push(['CCT', c.cct === null ? '— (far from the Planckian locus or outside 2000–10000 K)' : `${fmt(c.cct, 0)} K`]);
    rows.push([`Δu′v′ from ${c.whiteRef === 'D65' ? 'D65' : 'the display white'}`, fmt(c.duvFromWhite)]);
    rows.push(['colour uniformity (max Δu′v′)', fmt(c.uniformityDuv)]);
  }
  if (r.absoluteLuminance) {
    const a = r.absoluteLuminance;
    rows.push([`cd/m² on / off / ambient (${a.kind})`, `${fmt(a.on, 1)} / ${fmt(a.off, 1)} / ${fmt(a.ambient, 1)}`]);
  }
  const brackets = (r as CaptureResult & Pick<BracketedResult, 'brackets'>).brackets;
  for (const [roleName, b] of Object.entries(brackets ?? {})) {
    if (b) rows.push([`${roleName} bracket`, `${b.count} photos, dynamic range ${b.dynamicRange === null ? '—' : `${fmt(b.dynamicRange, 0)}:1 (${fmt(b.stops, 1)} stops)`}`]);
  }
  const width = Math.max(...rows.map(([k]) => k.length));
  const lines = rows.map(([k, v]) => `${k.padEnd(width)}  ${v}`);
  for (const w of r.warnings) lines.push(`warning ${w.code}: ${w.message}`);
  return lines.join('\n');
}

async function run(args: string[], out: NodeJS.WritableStream): Promise<void> {
  let values: Record<string, string | boolean | string[] | undefined>;
  try {
    ({ values } = parseArgs({
      options: {
        on: { type: 'string', multiple: true },
        off: { type: 'string', multiple: true },
        ambient: { type: 'string', multiple: true },
        dark: { type: 'string', multiple: true },
        pattern: { type: 'string', default: 'full' },
        screen: { type: 'string' },
        background: { type: 'string' },
        'ghost-offset': { type: 'string' },
        calibration: { type: 'string' },
        'degrees-per-pixel': { type: 'string' },
        'display-resolution': { type: 'string' },
        'display-white': { type: 'string' },
        linear16: { type: 'boolean', default: false },
        artifacts: { type: 'string' },
        json: { type: 'boolean', default: false },
      },
      args,
      strict: true,
      allowPositionals: false,
    }));
  } catch (e) {
    throw new EngineInputError('bad-argument', (e as Error).message.split('\n')[0] ?? 'bad arguments');
  }
  const str = (k: string): string | undefined => (typeof values[k] === 'string' ? (values[k] as string) : undefined);
  const files = (k: string): string[] => (Array.isArray(values[k]) ? (values[k] as string[]) : []);
  // one file stays a plain path, so single-photo runs take exactly the path they always took
  const role = (k: string): string | string[] | null => {
    const f = files(k);
    return f.length === 0 ? null : f.length === 1 ? (f[0] as string) : f;
  };
  const on = role('on');
  const off = role('off');
  if (!on || !off) throw new EngineInputError('bad-argument', 'both --on FILE and --off FILE are required');
  const pattern = str('pattern') as Pattern;
  if (pattern !== 'full' && pattern !== 'checkerboard' && pattern !== 'slanted-edge' && pattern !== 'orientation') throw new EngineInputError('bad-argument', `--pattern must be full, checkerboard, slanted-edge or orientation, got "${pattern}"`);
  const go = str('ghost-offset');
  let ghostOffset: Offset | 'none' | null = null;
  if (go === 'none') ghostOffset = 'none';
  else if (go !== undefined) {
    const [dx, dy] = ints('ghost-offset', go, 2) as [number, number];
    ghostOffset = { dx, dy };
  }
  const cal = str('calibration');
  const calibration = cal === undefined ? null : Number(cal);
  if (calibration !== null && !(Number.isFinite(calibration) && calibration > 0)) {
    throw new EngineInputError('bad-argument', `--calibration must be a positive number, got "${cal}"`);
  }
  const dppText = str('degrees-per-pixel');
  const degreesPerPixel = dppText === undefined ? null : Number(dppText);
  if (degreesPerPixel !== null && !(Number.isFinite(degreesPerPixel) && degreesPerPixel > 0)) {
    throw new EngineInputError('bad-argument', `--degrees-per-pixel must be a positive number, got "${dppText}"`);
  }
  const optics = { degreesPerPixel, displayResolution: resolution('display-resolution', str('display-resolution')), displayWhite: chromaticityOption('display-white', str('display-white')) };
  const wantArtifacts = str('artifacts');
  const { result, artifacts, rawWhiteBalance } = await analyzeFiles({
    on,
    off,
    ambient: role('ambient'),
    dark: role('dark'),
    pattern,
    screen: rect('screen', str('screen')),
    background: rect('background', str('background')),
    ghostOffset,
    calibration,
    optics,
    linear16: values.linear16 === true,
    artifacts: wantArtifacts !== undefined,
  });
  if (wantArtifacts !== undefined && artifacts) await writeArtifacts(wantArtifacts, artifacts);
  // the white balance raw photos were decoded with goes with the JSON reading (absent without raw photos)
  const reading = rawWhiteBalance ? { ...result, rawWhiteBalance } : result;
  const rawLine = rawWhiteBalance ? `\nraw white balance  ${rawWhiteBalance.source === 'daylight' ? 'the camera\'s daylight multipliers' : 'unity (no colour data for this camera)'} R ${rawWhiteBalance.multipliers[0].toFixed(3)}, G ${rawWhiteBalance.multipliers[1].toFixed(3)}, B ${rawWhiteBalance.multipliers[2].toFixed(3)}, the same for every raw photo` : '';
  out.write(values.json === true ? `${JSON.stringify(reading)}\n` : `${table(result)}${rawLine}\n`);
}

const help = `Usage: veilmeter analyze --on FILE --off FILE [options]

Measures one capture from its photos (display on, display off, and optionally ambient and dark)
and prints the readings as a table, or as one JSON object with --json.

Photos (JPEG, PNG, TIFF or WebP, 8 or 16 bits, or camera raw: DNG, CR2, CR3, NEF, ARW, RAF, ORF,
RW2, PEF, SRW; the same camera settings for all; repeat an option to give a bracket of one role at
different exposures). Raw files are decoded to linear 16-bit by libraw's dcraw_emu (Debian package
libraw-bin), all of them with one fixed white balance: the first raw photo's daylight multipliers
(never the camera's as-shot or automatic balance); --linear16 is not needed for them:
  --on FILE               display on, showing the test pattern, lighting as under test (required)
  --off FILE              the same view with the display dark (required)
  --ambient FILE          the same scene with the optics out of the path: the reference for
                          transmission and tint
  --dark FILE             display on, room dark: the ghost and uniformity are then measured on it

Measurement:
  --pattern full|checkerboard|slanted-edge|orientation
                          what the display showed: full-field white (default), the 4 × 4
                          checkerboard (adds the checkerboard contrast), the slanted-edge square
                          (adds the sharpness: MTF50 and the MTF curve) or the orientation marker
                          (adds how the optics turned or mirrored the image)
  --screen x,y,w,h        the virtual image's rectangle in pixels of the on photo (default: detected
                          from on − off)
  --background x,y,w,h    a see-through rectangle away from the screen, for transmission and tint
                          (default: measured over the screen, with a warning)
  --ghost-offset dx,dy    the ghost's position minus the screen's, in pixels (default: searched for)
  --ghost-offset none     no ghost reading
  --calibration K         a camera profile's factor in cd/m² per unit of Y·N²/(t·S), for readings
                          in cd/m² (needs exposure EXIF on the on photo)
  --degrees-per-pixel D   the camera's angle per pixel, measured on a target of known angle: the field
                          of view then comes from it instead of the EXIF focal length
  --display-resolution WxH
                          the display's resolution in pixels, for pixels per degree
  --display-white x,y     the display's own white chromaticity, the reference for Δu′v′ (default D65)
  --linear16              16-bit TIFFs hold linear values (no sRGB decoding)

Output:
  --json                  one JSON object on stdout instead of the table
  --artifacts DIR         also write the maps into DIR: log-contrast.png, difference.png, maps.json
  -h, --help              this text

${EXIT_CODES}

Example:
  npx veilmeter analyze --on on.jpg --off off.jpg --ambient ambient.jpg --json`;

export const analyzeCommand: Command = {
  summary: 'measure contrast, ghost, transmission and tint from photos on disk',
  help,
  run,
};
