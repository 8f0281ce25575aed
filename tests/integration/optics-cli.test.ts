import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderOpticsScene } from '../fixtures/optics-scene';
import { gaussianMtf50 } from '../fixtures/slanted-edge';
import { encodeTiff16 } from '../fixtures/tiff16';

const root = join(import.meta.dirname, '..', '..');
// the CLI runs compiled, as `npx veilmeter` runs it: built once into a folder of this file's own
const outdir = join(root, '.build', `optics-cli-test-${process.pid}`);
let dir: string;
const cli = (...args: string[]) => {
  const r = spawnSync(process.execPath, [join(outdir, 'cli', 'veilmeter.mjs'), 'analyze', ...args], { cwd: root, encoding: 'utf8', timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
};
const SIGMA = 1.5;

beforeAll(() => {
  const b = spawnSync(process.execPath, ['scripts/build-worker.mjs', '--outdir', relative(root, outdir)], { cwd: root, encoding: 'utf8', timeout: 120_000 });
  if (b.status !== 0) throw new Error(`CLI build failed: ${b.stderr}`);
  dir = mkdtempSync(join(tmpdir(), 'veilmeter-optics-cli-'));
  const s = renderOpticsScene({ width: 1200, height: 800, screen: { x: 300, y: 200, w: 600, h: 400 }, pattern: 'slanted-edge', white: [0.5, 0.46, 0.42], sigma: SIGMA, room: 0.08, noise: 0.003, seed: 31 });
  writeFileSync(join(dir, 'on.tif'), encodeTiff16(s.on.data as Uint16Array, 1200, 800));
  writeFileSync(join(dir, 'off.tif'), encodeTiff16(s.off.data as Uint16Array, 1200, 800));
}, 180_000);

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
  rmSync(outdir, { recursive: true, force: true });
});

describe('analyze CLI: sharpness, field of view and display colour', () => {
  it('gives sharpness, geometry and displayColour under the contract keys with --pattern slanted-edge', () => {
    const r = cli('--on', join(dir, 'on.tif'), '--off', join(dir, 'off.tif'), '--linear16', '--pattern', 'slanted-edge', '--degrees-per-pixel', '0.01', '--display-resolution', '1280x720', '--display-white', '0.3127,0.3290', '--ghost-offset', 'none', '--json');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout) as Record<string, Record<string, unknown>>;
    expect(Object.keys(j.sharpness ?? {}).sort()).toEqual(['curve', 'edgeAngle', 'mtf50', 'mtf50PerDegree']);
    expect(Object.keys(j.geometry ?? {}).sort()).toEqual(['degreesPerPixel', 'fovD', 'fovH', 'fovV', 'pixelsPerDegree', 'source']);
    expect(Object.keys(j.displayColour ?? {}).sort()).toEqual(['cct', 'duvFromWhite', 'u', 'uniformityDuv', 'v', 'whiteRef', 'x', 'y']);
    // MTF50 of a Gaussian blur, √(ln 2 / (2π²σ²)) (derived)
    expect(Math.abs((j.sharpness?.mtf50 as number) / gaussianMtf50(SIGMA) - 1)).toBeLessThan(0.03);
    expect(j.sharpness?.mtf50PerDegree).toBeCloseTo((j.sharpness?.mtf50 as number) / 0.01, 0);
    expect(j.geometry?.source).toBe('camera-profile');
    // 600 px at 0.01°/px through a pinhole: 2·atan(300·tan 0.01°) (derived)
    expect(j.geometry?.fovH).toBeCloseTo((2 * Math.atan(300 * Math.tan((0.01 * Math.PI) / 180)) * 180) / Math.PI, 2);
    expect(j.geometry?.pixelsPerDegree).toBeCloseTo(1280 / (j.geometry?.fovH as number), 1);
    expect(j.displayColour?.whiteRef).toBe('display');
    // the slanted-edge screen is not a uniform field: no colour uniformity
    expect(j.displayColour?.uniformityDuv).toBeNull();
  });

  it('prints the readings in the table and refuses a malformed display resolution with one line', () => {
    const t = cli('--on', join(dir, 'on.tif'), '--off', join(dir, 'off.tif'), '--linear16', '--pattern', 'slanted-edge', '--degrees-per-pixel', '0.01', '--ghost-offset', 'none');
    expect(t.status).toBe(0);
    expect(t.stdout).toMatch(/MTF50\s+0\.\d+ cycles\/pixel · \d+\.\d+ cycles\/degree/);
    expect(t.stdout).toMatch(/field of view H \/ V \/ D\s+6\.\d+° \/ 4\.\d+°/);
    const bad = cli('--on', join(dir, 'on.tif'), '--off', join(dir, 'off.tif'), '--display-resolution', '1280 by 720');
    expect(bad.status).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
    expect(bad.stderr).toMatch(/--display-resolution needs/);
    const pattern = cli('--on', join(dir, 'on.tif'), '--off', join(dir, 'off.tif'), '--pattern', 'edge');
    expect(pattern.status).toBe(2);
    expect(pattern.stderr).toMatch(/full, checkerboard, slanted-edge or orientation/);
  });
});
