/**
 * Output channels of the command line, passed to every subcommand so tests can run a command
 * in-process and read what it printed.
 */

/** Where a command writes: `out` for results (stdout), `err` for problems and usage (stderr). */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
}

/** The real process streams. */
export const processIo: CliIo = {
  out: (text) => void process.stdout.write(text),
  err: (text) => void process.stderr.write(text),
};

/** A command's entry point: arguments after the command name in, exit status out. */
export type RunCommand = (args: string[], io?: CliIo) => Promise<number>;

/** Exit statuses shared by the commands (README: Commands). */
export const EXIT_OK = 0;
export const EXIT_BAD_INPUT = 1;
export const EXIT_USAGE = 2;
