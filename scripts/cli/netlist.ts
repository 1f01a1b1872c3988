// placeholder until its issue lands: this file will be overwritten by the `netlist` command.
import { EXIT_USAGE, processIo, type CliIo } from './io.ts';

/** Run `netlist` with the arguments after the command name. */
export async function run(_args: string[], io: CliIo = processIo): Promise<number> {
  io.err('motional netlist: not yet available\n');
  return EXIT_USAGE;
}
