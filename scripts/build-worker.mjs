// Compiles the worker, its analysis processor, the engine benchmark and the veilmeter CLI ahead of
// time into .build/
// (git-ignored), so they run on plain Node. Loading the TypeScript through tsx at run time instead
// slows the engine's JavaScript by about a third: its loader hooks stay in the process (and in the
// processor's worker thread) for as long as it runs.
//
//   node scripts/build-worker.mjs          build (well under a second)
//   node scripts/build-worker.mjs --outdir DIR   build elsewhere (tests; DIR inside the project, so
//                                          npm packages still resolve from node_modules)
//   node .build/worker/index.mjs           run a worker
//   node .build/bench/engine.mjs           run the engine benchmark (npm run bench does both)
//   node .build/cli/veilmeter.mjs analyze …    the CLI (scripts/veilmeter.mjs, package.json "bin", runs it)
import { build } from 'esbuild';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const at = process.argv.indexOf('--outdir');
const outdir = at > 0 && process.argv[at + 1] ? join(process.cwd(), process.argv[at + 1]) : join(root, '.build');

try {
  await build({
    absWorkingDir: root,
    entryPoints: {
      'worker/index': 'worker/index.ts',
      // worker/index resolves './processors/analysis-entry.mjs' beside itself: here, the compiled processor
      'worker/processors/analysis-entry': 'worker/processors/analysis.ts',
      'bench/engine': 'bench/engine.ts',
      'cli/veilmeter': 'scripts/cli/run.ts',
    },
    outdir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    // npm packages load from node_modules as usual; only the project's own TypeScript is compiled
    packages: 'external',
    platform: 'node',
    format: 'esm',
    target: 'node20',
    sourcemap: 'linked',
    logLevel: 'warning',
  });
} catch (e) {
  process.stderr.write(`worker build failed: ${e instanceof Error ? e.message : String(e)}\n`);
  process.exit(1);
}
