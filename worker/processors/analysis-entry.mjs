// BullMQ loads this in a worker thread. Node does not carry tsx's loader into worker threads, so
// the thread registers it itself before importing the TypeScript processor.
import { register } from 'tsx/esm/api';

register();
const { default: processAnalysis } = await import('./analysis.ts');

export default processAnalysis;
