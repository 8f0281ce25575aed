import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ENGINE_VERSION } from '../../lib/photometry/version';
import { renderCapture } from '../fixtures/capture-generator';

const root = join(import.meta.dirname, '..', '..');
// the CLI runs compiled, as `npx veilmeter` runs it: built once into a folder of this file's own
const outdir = join(root, '.build', `cli-test-${process.pid}`);
let dir: string;
const veilmeter = (...args: string[]) => {
  const r = spawnSync(process.execPath, [join(outdir, 'cli', 'veilmeter.mjs'), ...args], { cwd: root, encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
};
const cli = (...args: string[]) => veilmeter('analyze', ...args);

beforeAll(async () => {
  const b = spawnSync(process.execPath, ['scripts/build-worker.mjs', '--outdir', relative(root, outdir)], { cwd: root, encoding: 'utf8', timeout: 60_000 });
  if (b.status !== 0) throw new Error(`CLI build failed: ${b.stderr}`);
  dir = mkdtempSync(join(tmpdir(), 'veilmeter-cli-'));
  const c = await renderCapture({ seed: 21, width: 480, height: 360, ghost: { gain: 0.04, dx: 9, dy: 6 } });
  writeFileSync(join(dir, 'on.jpg'), c.on);
  writeFileSync(join(dir, 'off.jpg'), c.off);
  writeFileSync(join(dir, 'ambient.jpg'), c.ambient);
  writeFileSync(join(dir, 'notes.txt'), 'not a photo');
  writeFileSync(join(dir, 'small.png'), await sharp({ create: { width: 100, height: 80, channels: 3, background: '#808080' } }).png().toBuffer());
  writeFileSync(join(dir, 'IMG_0001.HEIC'), Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic'), Buffer.alloc(40)]));
  const moved = await renderCapture({ seed: 22, width: 480, height: 360, shifts: { off: { dx: 36, dy: 0 } }, ghost: null });
  writeFileSync(join(dir, 'moved-on.jpg'), moved.on);
  writeFileSync(join(dir, 'moved-off.jpg'), moved.off);
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
  rmSync(outdir, { recursive: true, force: true });
});

describe('analyze CLI', () => {
  it('prints exactly one JSON object of the reading shape with --json', () => {
    const r = cli('--on', join(dir, 'on.jpg'), '--off', join(dir, 'off.jpg'), '--ambient', join(dir, 'ambient.jpg'), '--json');
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines).toHaveLength(1);
    const j = JSON.parse(lines[0] as string) as Record<string, unknown>;
    for (const k of ['engineVersion', 'image', 'pattern', 'registration', 'screen', 'luminance', 'ambientContrastRatio', 'michelson', 'ansiContrast', 'uniformity', 'ghost', 'transmission', 'tint', 'clippedFraction', 'warnings', 'transmissionOptics', 'veil', 'uncertainty']) {
      expect(j).toHaveProperty(k);
    }
    expect(j.engineVersion).toBe('1.2.0');
    // the contract's uncertainty: a standard uncertainty per metric given, on the metric's own scale
    const u = j.uncertainty as Record<string, number>;
    expect(u.ambientContrastRatio).toBeGreaterThan(0);
    expect(u.transmission).toBeGreaterThan(0);
  });

  it('prints a readable table without --json', () => {
    const r = cli('--on', join(dir, 'on.jpg'), '--off', join(dir, 'off.jpg'), '--screen', '120,90,240,180', '--ghost-offset', 'none');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/ambient contrast ratio\s+\d/);
    expect(r.stdout).toMatch(/ghost ratio\s+none found/);
  });

  const bad: [string, string[], RegExp][] = [
    ['a missing file', ['--on', 'nope.jpg', '--off', 'off.jpg'], /does not exist/],
    ['an unreadable path (a folder)', ['--on', '.', '--off', 'off.jpg'], /folder/],
    ['a file that is not an image', ['--on', 'notes.txt', '--off', 'off.jpg'], /not an image/],
    ['an unsupported format (HEIC)', ['--on', 'IMG_0001.HEIC', '--off', 'off.jpg'], /HEIC is not supported: export the photo as 16-bit TIFF or JPEG/],
    ['photos of different sizes', ['--on', 'on.jpg', '--off', 'small.png'], /100 × 80 but the on photo is 480 × 360/],
    ['a region outside the image', ['--on', 'on.jpg', '--off', 'off.jpg', '--screen', '400,300,200,100'], /outside/],
    ['an empty region', ['--on', 'on.jpg', '--off', 'off.jpg', '--background', '10,10,0,5'], /empty/],
    ['a malformed region', ['--on', 'on.jpg', '--off', 'off.jpg', '--screen', '1,2,3'], /4 whole numbers/],
    ['a camera that moved too far', ['--on', 'moved-on.jpg', '--off', 'moved-off.jpg'], /moved .* reshoot/],
    ['a missing --off', ['--on', 'on.jpg'], /--off FILE/],
    ['an unknown option', ['--on', 'on.jpg', '--off', 'off.jpg', '--colour'], /colour/],
    ['a bad pattern', ['--on', 'on.jpg', '--off', 'off.jpg', '--pattern', 'stripes'], /full, checkerboard, slanted-edge or orientation/],
    ['a bad calibration', ['--on', 'on.jpg', '--off', 'off.jpg', '--calibration=abc'], /positive number/],
  ];
  it.each(bad)('exits 2 with one line and no stack trace for %s', (_name, args, message) => {
    const r = cli(...args.map((a) => (a.startsWith('--') || /^[\d,]+$|^-\d|^stripes$/.test(a) ? a : join(dir, a))));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    const lines = r.stderr.split('\n').filter((l) => l !== '');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(message);
    expect(r.stderr).not.toContain('    at ');
  });
});

describe('veilmeter command line', () => {
  it('lists every analyze option, the exit codes and an example under analyze --help', () => {
    const r = veilmeter('analyze', '--help');
    expect(r.status).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(/^Usage: veilmeter analyze --on FILE --off FILE/);
    // every option the parser accepts is explained
    const source = readFileSync(join(root, 'scripts', 'cli', 'analyze.ts'), 'utf8');
    const block = /options: \{([\s\S]*?)\n {6}\},/.exec(source)?.[1] ?? '';
    const names = [...block.matchAll(/^\s+'?([a-z0-9-]+)'?: \{ type/gm)].map((m) => m[1]);
    expect(names.length).toBeGreaterThanOrEqual(12);
    for (const name of names) expect(r.stdout).toMatch(new RegExp(`^\\s+--${name}\\b`, 'm'));
    for (const code of ['0', '1', '2']) expect(r.stdout).toMatch(new RegExp(`^\\s+${code}\\s+\\S`, 'm'));
    expect(r.stdout).toContain('npx veilmeter analyze --on');
    // -h and `help analyze` say the same
    expect(veilmeter('analyze', '-h').stdout).toBe(r.stdout);
    expect(veilmeter('help', 'analyze').stdout).toBe(r.stdout);
  });

  it('names its commands under --help, and prints the usage on stderr with status 2 when given none', () => {
    const help = veilmeter('--help');
    expect(help.status).toBe(0);
    expect(help.stdout).toMatch(/Usage: veilmeter <command>/);
    expect(help.stdout).toMatch(/^\s+analyze\s+measure/m);
    const none = veilmeter();
    expect(none.status).toBe(2);
    expect(none.stdout).toBe('');
    expect(none.stderr).toContain('Usage: veilmeter <command>');
  });

  it('prints its version and the engine version', () => {
    const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { version: string };
    for (const flag of ['--version', '-v']) {
      const r = veilmeter(flag);
      expect(r.status).toBe(0);
      expect(r.stdout).toBe(`veilmeter ${pkg.version} (engine ${ENGINE_VERSION})\n`);
    }
  });

  it('refuses an unknown command in one line with status 2', () => {
    const r = veilmeter('analyse', '--on', 'a.jpg');
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/unknown command "analyse" \(commands: analyze/);
  });

  it('is the package\'s bin, and npx runs it', () => {
    const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { bin?: Record<string, string> };
    expect(pkg.bin?.veilmeter).toBe('scripts/veilmeter.mjs');
    expect(existsSync(join(root, 'scripts', 'veilmeter.mjs'))).toBe(true);
    const r = spawnSync('npx', ['--no-install', 'veilmeter', '--version'], { cwd: root, encoding: 'utf8', timeout: 60_000 });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^veilmeter \d+\.\d+\.\d+ \(engine /);
  });
});
