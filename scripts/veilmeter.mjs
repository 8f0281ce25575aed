#!/usr/bin/env node
// The `veilmeter` command (package.json "bin": `npx veilmeter analyze …` in this folder). It runs the
// CLI compiled ahead of time, on plain Node, like the worker: .build/cli/veilmeter.mjs, made by
// `node scripts/build-worker.mjs` (npm start, npm test and `npm run build:worker` run it). When
// that file is missing and the build tool is installed, it is built first.
import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const compiled = join(root, '.build', 'cli', 'veilmeter.mjs');

if (!existsSync(compiled)) {
  const built = existsSync(join(root, 'node_modules', 'esbuild'))
    ? spawnSync(process.execPath, [join(root, 'scripts', 'build-worker.mjs')], { cwd: root, stdio: ['ignore', 'ignore', 'inherit'] }).status === 0
    : false;
  if (!built) {
    process.stderr.write('internal error: the compiled CLI (.build/cli/veilmeter.mjs) is missing: run `node scripts/build-worker.mjs` where the development dependencies are installed, or copy .build/ from the machine that built it\n');
    process.exit(1);
  }
}
await import(pathToFileURL(compiled).href);
