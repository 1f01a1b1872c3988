/**
 * Output channels of the command line, passed to every subcommand so tests can run a command
 * in-process and read what it printed.
 */

import { parseArgs, type ParseArgsConfig } from 'node:util';

type ParseArgsOptionsConfig = NonNullable<ParseArgsConfig['options']>;

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

/** What `parseArgs` returns for a command's options (positionals allowed). */
export type ParsedCommand<O extends ParseArgsOptionsConfig> = ReturnType<
  typeof parseArgs<{ args: string[]; allowPositionals: true; options: O }>
>;

/**
 * A command's flags through `node:util` parseArgs. On a bad flag it prints the problem and the
 * usage and returns {@link EXIT_USAGE}; on `--help` (an option the command declares) it prints the
 * usage and returns {@link EXIT_OK}; else the parsed values and positionals.
 */
export function parseCommandArgs<O extends ParseArgsOptionsConfig>(
  command: string,
  args: string[],
  options: O,
  usage: string,
  io: CliIo,
): ParsedCommand<O> | number {
  let parsed: ParsedCommand<O>;
  try {
    parsed = parseArgs({ args, allowPositionals: true, options });
  } catch (e) {
    io.err(`motional ${command}: ${e instanceof Error ? e.message : String(e)}\n\n${usage}`);
    return EXIT_USAGE;
  }
  if ((parsed.values as Record<string, unknown>).help) {
    io.out(usage);
    return EXIT_OK;
  }
  return parsed;
}
