// BullMQ loads this in a worker thread when the worker runs from source (`npx tsx worker/index.ts`,
// for development). Node does not carry tsx's loader into worker threads, so the thread registers
// it itself before importing the TypeScript processor. npm start and npm run worker run the
// compiled worker instead (scripts/build-worker.mjs), whose processor file of this name sits
// beside it in .build/worker/processors/.
import { register } from 'tsx/esm/api';

register();
const { default: processAnalysis } = await import('./analysis.ts');

export default processAnalysis;
