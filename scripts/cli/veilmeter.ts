// The veilmeter command line: `veilmeter <command> [options]`. Each command is one entry of COMMANDS
// (a Command of ./command.ts); adding one (a `push` that uploads a capture through the token API,
// say) is a new file and a new line there, and the help, the errors and the exit codes follow.
// Runs compiled on plain Node like the worker: scripts/build-worker.mjs bundles it into
// .build/cli/veilmeter.mjs, and scripts/veilmeter.mjs (package.json "bin") starts that.
import { ENGINE_VERSION } from '../../lib/photometry/version';
import { EngineInputError } from '../../lib/photometry/errors';
import pkg from '../../package.json';
import { analyzeCommand } from './analyze';
import { CommandFailed, EXIT_CODES, UsageError, type Command } from './command';
import { pushCommand } from './push';

export const COMMANDS: Record<string, Command> = {
  analyze: analyzeCommand,
  push: pushCommand,
};

const VERSION = `veilmeter ${pkg.version} (engine ${ENGINE_VERSION})`;

function usage(): string {
  const width = Math.max(...Object.keys(COMMANDS).map((k) => k.length));
  const list = Object.entries(COMMANDS)
    .map(([name, c]) => `  ${name.padEnd(width)}  ${c.summary}`)
    .join('\n');
  return `Usage: veilmeter <command> [options]

Commands:
${list}

Options:
  -h, --help      this text; \`veilmeter <command> --help\` lists a command's options
  -v, --version   the program's and the measurement engine's versions

${EXIT_CODES}`;
}

const isHelp = (a: string | undefined) => a === '--help' || a === '-h';

/** Runs one command line; resolves to the exit status. Output goes to `out`, errors to `err`. */
export async function main(argv: string[], out: NodeJS.WritableStream = process.stdout, err: NodeJS.WritableStream = process.stderr): Promise<number> {
  const [first, ...rest] = argv;
  try {
    if (first === undefined) {
      err.write(`${usage()}\n`);
      return 2;
    }
    if (isHelp(first)) {
      out.write(`${usage()}\n`);
      return 0;
    }
    if (first === '--version' || first === '-v') {
      out.write(`${VERSION}\n`);
      return 0;
    }
    if (first === 'help') {
      const c = rest[0] === undefined ? undefined : COMMANDS[rest[0]];
      if (rest[0] !== undefined && !c) throw new UsageError(`unknown command "${rest[0]}" (commands: ${Object.keys(COMMANDS).join(', ')})`);
      out.write(`${c ? c.help : usage()}\n`);
      return 0;
    }
    const command = Object.hasOwn(COMMANDS, first) ? COMMANDS[first] : undefined;
    if (!command) {
      throw new UsageError(first.startsWith('-') ? `unknown option "${first}": give a command first (commands: ${Object.keys(COMMANDS).join(', ')}; see veilmeter --help)` : `unknown command "${first}" (commands: ${Object.keys(COMMANDS).join(', ')}; see veilmeter --help)`);
    }
    if (rest.some(isHelp)) {
      out.write(`${command.help}\n`);
      return 0;
    }
    await command.run(rest, out);
    return 0;
  } catch (e) {
    if (e instanceof CommandFailed) {
      err.write(`error: ${e.message.replace(/\s+/g, ' ')}\n`);
      return e.exitCode;
    }
    if (e instanceof UsageError || e instanceof EngineInputError) {
      err.write(`error: ${e.message.replace(/\s+/g, ' ')}\n`);
      return 2;
    }
    // a bug, not the user's input: still one line; run the engine under a debugger for the stack
    err.write(`internal error: ${e instanceof Error ? e.message.replace(/\s+/g, ' ') : String(e)}\n`);
    return 1;
  }
}
