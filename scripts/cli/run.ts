// The CLI's process entry (bundled to .build/cli/veilmeter.mjs): runs main() on the arguments and
// exits with its status once the output is written.
import { main } from './veilmeter';

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
