/**
 * Engine benchmark: decode-only time of a 6000 × 4000 JPEG triplet (the floor) against the full
 * analysis (decode through artifacts), medians of 5 runs after a warm-up of 5,
 * peak RSS, and the first (cold) analysis of the process apart.
 * `npm run bench -- --json` prints one JSON object; either way bench/RESULTS.md is rewritten.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { writeFile } from 'node:fs/promises';
import { cpus, loadavg, tmpdir, totalmem } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { analyzeFiles, decodeRawOnly, writeArtifacts } from '../lib/image';
import { opticsCosts } from './optics-cost';

const RUNS = 5;
// V8 optimises the engine's loops over its first few calls (a worker process analyses capture sets
// one after another, so the steady state is what users get); the first analysis is reported apart
const WARMUP = 5;
// npm run bench runs this compiled from .build/bench/ (as the worker runs the engine); its files stay in bench/
const here = fileURLToPath(new URL('.', import.meta.url)).replace(/[\\/]\.build[\\/]bench[\\/]?$/, '/bench');
const dir = join(tmpdir(), 'veilmeter-bench-6000x4000-q90-v1');
const names = ['on.jpg', 'off.jpg', 'ambient.jpg'] as const;
const paths = names.map((n) => join(dir, n));
if (!paths.every((p) => existsSync(p))) {
  mkdirSync(dir, { recursive: true });
  execFileSync(process.execPath, ['--import', 'tsx', join(here, 'make-photos.ts'), dir], { stdio: 'inherit' });
}
const bytes = paths.map((p) => readFileSync(p));
const outDir = join(dir, 'artifacts');

/** Wall time of one run, and the CPU time the process spent in it (every thread, user + system). */
type Run = { wall: number; cpu: number };
async function timed(f: () => Promise<unknown>): Promise<Run> {
  const c = process.cpuUsage();
  const t = performance.now();
  await f();
  const wall = performance.now() - t;
  const used = process.cpuUsage(c);
  return { wall, cpu: (used.user + used.system) / 1000 };
}

async function decodeOnly(): Promise<void> {
  await Promise.all(bytes.map((b) => decodeRawOnly(b)));
}

// what the engine 1.2.0 steps cost inside each analysis, read from its progress reports: the see-through
// fit (off against ambient, with its four half-pixel refits) and the uncertainty of every figure
const STEPS = { fit: ['see-through fit', 'uncertainty'], uncertainty: ['uncertainty', 'sharpness, geometry, colour'] } as const;
type StepTimes = Record<keyof typeof STEPS, number>;
let lastSteps: StepTimes = { fit: Number.NaN, uncertainty: Number.NaN };

async function analysis(): Promise<void> {
  const at = new Map<string, number>();
  const { artifacts } = await analyzeFiles({
    on: { name: 'on.jpg', bytes: bytes[0] as Buffer },
    off: { name: 'off.jpg', bytes: bytes[1] as Buffer },
    ambient: { name: 'ambient.jpg', bytes: bytes[2] as Buffer },
    // the last report of a stage wins: the full set's analysis runs after the on/off part
    onProgress: (stage) => at.set(stage, performance.now()),
  });
  const span = ([a, b]: readonly [string, string]): number => ((at.get(b) ?? Number.NaN) - (at.get(a) ?? Number.NaN));
  lastSteps = { fit: span(STEPS.fit), uncertainty: span(STEPS.uncertainty) };
  if (artifacts) await writeArtifacts(outDir, artifacts);
}

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] as number;
};

const cold = await timed(analysis);
await decodeOnly();
for (let i = 1; i < WARMUP; i++) {
  await decodeOnly();
  await analysis();
}
const decodeRuns: Run[] = [];
const analysisRuns: Run[] = [];
const stepRuns: StepTimes[] = [];
for (let i = 0; i < RUNS; i++) {
  decodeRuns.push(await timed(decodeOnly));
  analysisRuns.push(await timed(analysis));
  stepRuns.push(lastSteps);
}
const decodes = decodeRuns.map((r) => r.wall);
const analyses = analysisRuns.map((r) => r.wall);
const decodeMs = Math.round(median(decodes));
const analysisMs = Math.round(median(analyses));
const ratio = Math.round((analysisMs / decodeMs) * 100) / 100;
const peakRssMb = Math.round(process.resourceUsage().maxRSS / 1024);
// CPU time beside wall time: how much work each is, whatever the cores did in parallel
const decodeCpuMs = Math.round(median(decodeRuns.map((r) => r.cpu)));
const analysisCpuMs = Math.round(median(analysisRuns.map((r) => r.cpu)));
const coldAnalysisMs = Math.round(cold.wall);
const step = (k: keyof StepTimes): number => Math.round(median(stepRuns.map((r) => r[k])) * 10) / 10;
const fitMs = step('fit');
const uncertaintyMs = step('uncertainty');
// what the optics readings cost on their own (after the peak RSS is read, so their photos do not count in it)
const optics = await opticsCosts(bytes[0] as Buffer, bytes[1] as Buffer);
const figures = { decodeMs, analysisMs, ratio, peakRssMb, decodeCpuMs, analysisCpuMs, coldAnalysisMs, fitMs, uncertaintyMs, optics };

const machine = `${cpus().length} × ${cpus()[0]?.model.trim() ?? 'cpu'}, ${Math.round(totalmem() / 2 ** 30)} GB, Node ${process.version}, load average ${loadavg()[0]?.toFixed(1)} at the end (other work on the machine slows both figures)`;
const md = `# Engine benchmark

6000 × 4000 JPEG triplet (on, off, ambient; quality 90), median of ${RUNS} runs after a warm-up of ${WARMUP} runs, one process.
Run on ${new Date().toISOString().slice(0, 10)}, ${machine}. Reproduce with \`npm run bench\`.

| figure | value | target |
| --- | --- | --- |
| decode only, three photos (sharp, the floor) | ${decodeMs} ms | |
| full analysis, decode through artifacts | ${analysisMs} ms | |
| ratio | ${ratio} | ≤ 1.6 |
| peak RSS | ${peakRssMb} MB | ≤ 1024 MB |
| CPU time of the decode only (all threads) | ${decodeCpuMs} ms | |
| CPU time of the full analysis (all threads) | ${analysisCpuMs} ms | |
| first analysis of the process (cold, before the warm-up) | ${coldAnalysisMs} ms | |
| of the analysis: see-through fit (transmission of the optics, veil; four half-pixel refits) | ${fitMs} ms | |
| of the analysis: standard uncertainty of every figure | ${uncertaintyMs} ms | |
| of the analysis: display colour (every capture; 3 × 3 cells of on and off, sampled rows) | ${optics.colourMs} ms | |
| of the analysis: field of view (every capture with a profile or EXIF focal length) | ${optics.geometryMs} ms | |
| slanted-edge sharpness (slanted-edge captures only; four edges, MTF50 ${optics.sharpnessMtf50?.toFixed(3) ?? '—'} cycles/pixel) | ${optics.sharpnessMs} ms | |
`;
// hand-written notes below the generated table survive a re-run
const resultsPath = join(here, 'RESULTS.md');
const previous = existsSync(resultsPath) ? readFileSync(resultsPath, 'utf8') : '';
const notesAt = previous.indexOf('\n## Notes');
await writeFile(resultsPath, notesAt >= 0 ? md + previous.slice(notesAt) : md);
if (process.argv.includes('--json')) process.stdout.write(`${JSON.stringify(figures)}\n`);
else process.stdout.write(`decode ${decodeMs} ms · analysis ${analysisMs} ms · ratio ${ratio} · peak RSS ${peakRssMb} MB · CPU time: decode ${decodeCpuMs} ms, analysis ${analysisCpuMs} ms · first (cold) analysis ${coldAnalysisMs} ms · of it: see-through fit ${fitMs} ms, uncertainty ${uncertaintyMs} ms\noptics readings: display colour ${optics.colourMs} ms · field of view ${optics.geometryMs} ms · slanted-edge sharpness ${optics.sharpnessMs} ms (slanted-edge captures only)\nall runs: decode ${decodes.map(Math.round).join(', ')}; analysis ${analyses.map(Math.round).join(', ')}\n`);
