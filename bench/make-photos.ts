// Renders the benchmark's 6000 × 4000 JPEG triplet into a folder (run as its own process so the
// generator's memory does not count in the engine's peak RSS).
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { renderCapturePhotos } from '../tests/fixtures/capture-generator';

const dir = process.argv[2];
if (!dir) throw new Error('usage: make-photos DIR');
const W = 6000;
const H = 4000;
const c = await renderCapturePhotos({
  width: W,
  height: H,
  seed: 6000,
  screen: { x: 1800, y: 1200, w: 2400, h: 1600 },
  ghost: { gain: 0.03, dx: 48, dy: 30 },
  shifts: { off: { dx: 6, dy: -3 }, ambient: { dx: -5, dy: 4 } },
  quality: 90,
});
await Promise.all([
  writeFile(join(dir, 'on.jpg'), c.on),
  writeFile(join(dir, 'off.jpg'), c.off),
  writeFile(join(dir, 'ambient.jpg'), c.ambient),
]);
