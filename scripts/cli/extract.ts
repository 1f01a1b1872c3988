// placeholder until its issue lands: this file will be overwritten by the `extract` command.
import { EXIT_USAGE, processIo, type CliIo } from './io.ts';

/** Run `extract` with the arguments after the command name. */
export async function run(_args: string[], io: CliIo = processIo): Promise<number> {
  io.err('motional extract: not yet available\n');
  return EXIT_USAGE;
}
