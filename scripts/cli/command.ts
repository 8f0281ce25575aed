// What every subcommand of the veilmeter CLI provides (scripts/cli/veilmeter.ts keeps the table).

/** Bad arguments or input the user can fix: one line on stderr and exit status 2. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

/** A failure with its own exit status (a command's help lists them): one line on stderr. */
export class CommandFailed extends Error {
  constructor(
    message: string,
    readonly exitCode: number,
  ) {
    super(message);
    this.name = 'CommandFailed';
  }
}

export type Command = {
  /** One line for the command list of `veilmeter --help`. */
  summary: string;
  /** The full text of `veilmeter <command> --help`: usage, every option, exit codes. */
  help: string;
  /** Runs with the arguments after the command's name; writes its answer to `out`. */
  run(args: string[], out: NodeJS.WritableStream): Promise<void>;
};

/** The exit codes every command uses, for the help texts. */
export const EXIT_CODES = `Exit status:
  0  done
  1  something failed that is not the input's fault (an internal error, or --artifacts could not be written)
  2  bad arguments, or input that cannot be measured (missing file, not a photo, photos of different sizes,
     a region outside the photo, a camera that moved too far); one line on stderr says which`;
