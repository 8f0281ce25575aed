/**
 * A digest of the engine's readings on 50 generated analyses (full field and checkerboard, with and
 * without a dark photo, ghosts in every direction, detected and marked backgrounds, one camera-size
 * capture). Run it before and after a change meant to be a pure speed-up: the same digest means the
 * same readings to the last bit. `npx tsx bench/readings-digest.ts [FILE]` also writes the readings
 * to FILE, one JSON line each, to compare when the digests differ.
 */
import { createHash } from 'node:crypto';
import { analyzeFiles } from '../lib/image';
import { renderCapture, type SceneOptions } from '../tests/fixtures/capture-generator';
const cases: SceneOptions[] = [];
let seed = 100;
for (const ghost of [{ gain: 0.04, dx: 14, dy: 9 }, { gain: 0.05, dx: -17, dy: 6 }, { gain: 0.03, dx: 11, dy: -13 }, { gain: 0.04, dx: 0, dy: 15 }, { gain: 0.04, dx: -12, dy: 0 }, null]) {
  for (const pattern of ['full', 'checkerboard'] as const) {
    for (const withDark of [false, true]) {
      cases.push({ width: 640, height: 480, seed: seed++, ghost, pattern, withDark, shifts: { off: { dx: 2, dy: -1 }, ambient: { dx: -3, dy: 2 } } });
    }
  }
}
cases.push({ width: 3000, height: 2000, seed: 7, ghost: { gain: 0.04, dx: 61, dy: 37 } });
const out: string[] = [];
for (const c of cases) {
  const r = await renderCapture(c);
  for (const marked of [false, true]) {
    const { result } = await analyzeFiles({
      on: { name: 'on.jpg', bytes: r.on }, off: { name: 'off.jpg', bytes: r.off }, ambient: { name: 'a.jpg', bytes: r.ambient }, dark: r.dark ? { name: 'd.jpg', bytes: r.dark } : null,
      pattern: r.truth.pattern, background: marked ? r.truth.background : null, artifacts: false,
    });
    out.push(JSON.stringify(result));
  }
}
console.log(out.length, createHash('sha256').update(out.join('\n')).digest('hex'));
if (process.argv[2]) (await import('node:fs')).writeFileSync(process.argv[2], out.join('\n'));
