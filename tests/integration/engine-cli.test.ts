import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderCapture } from '../fixtures/capture-generator';

const root = join(import.meta.dirname, '..', '..');
let dir: string;
const cli = (...args: string[]) => {
  const r = spawnSync(process.execPath, ['--import', 'tsx', join(root, 'scripts', 'analyze.ts'), ...args], { cwd: root, encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
};

beforeAll(async () => {
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

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('analyze CLI', () => {
  it('prints exactly one JSON object of the reading shape with --json', () => {
    const r = cli('--on', join(dir, 'on.jpg'), '--off', join(dir, 'off.jpg'), '--ambient', join(dir, 'ambient.jpg'), '--json');
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines).toHaveLength(1);
    const j = JSON.parse(lines[0] as string) as Record<string, unknown>;
    for (const k of ['engineVersion', 'image', 'pattern', 'registration', 'screen', 'luminance', 'ambientContrastRatio', 'michelson', 'ansiContrast', 'uniformity', 'ghost', 'transmission', 'tint', 'clippedFraction', 'warnings']) {
      expect(j).toHaveProperty(k);
    }
    expect(j.engineVersion).toBe('1.0.1');
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
    ['a bad pattern', ['--on', 'on.jpg', '--off', 'off.jpg', '--pattern', 'stripes'], /full or checkerboard/],
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
