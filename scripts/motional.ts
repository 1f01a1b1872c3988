/**
 * The `motional` command line (README: Commands): `npm run -s motional -- <command> ...`.
 *
 * A thin dispatcher: each command lives in scripts/cli/<command>.ts and exports
 * `run(args, io?): Promise<number>`, the exit status. Commands are imported only when used,
 * so `check` does not load the extraction or site code.
 *
 * Exit statuses: 0 done, 1 bad input (or an unexpected internal error), 2 usage error.
 * Bad input never prints a stack trace; set MOTIONAL_DEBUG=1 to see one for internal errors.
 */
import { pathToFileURL } from 'node:url';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, processIo, type CliIo, type RunCommand } from './cli/io.ts';

interface CommandEntry {
  /** Argument synopsis for the usage text. */
  synopsis: string;
  summary: string;
  load: () => Promise<{ run: RunCommand }>;
}

/** Every command; add a line here and a file in scripts/cli/ for a new one. */
export const COMMANDS: Record<string, CommandEntry> = {
  new: {
    synopsis: 'new FOLDER [--id ID] [--kind KIND]',
    summary: 'write a draft part.yaml from a folder of sweep files',
    load: () => import('./cli/new.ts'),
  },
  check: {
    synopsis: 'check PATH...',
    summary: 'validate part records and the sweep files they name',
    load: () => import('./cli/check.ts'),
  },
  extract: {
    synopsis: 'extract PART [--json]',
    summary: 'extract the motional parameters of one part',
    load: () => import('./cli/extract.ts'),
  },
  netlist: {
    synopsis: 'netlist PART [options]',
    summary: 'print a SPICE subcircuit of a part (first sample unless --sample)',
    load: () => import('./cli/netlist.ts'),
  },
  build: {
    synopsis: 'build [--content DIR] [--out DIR]',
    summary: 'validate, extract and build the catalogue site',
    load: () => import('./cli/build.ts'),
  },
  advise: {
    synopsis: 'advise PART [options]',
    summary: 'load-capacitor and start-up advice for a part',
    load: () => import('./cli/advise.ts'),
  },
  preview: {
    synopsis: 'preview [--content DIR]',
    summary: 'serve the catalogue while you edit records, rebuilding what changed',
    load: () => import('./cli/preview.ts'),
  },
};

export function usage(): string {
  const width = Math.max(...Object.values(COMMANDS).map((c) => c.synopsis.length));
  const lines = Object.values(COMMANDS).map((c) => `  ${c.synopsis.padEnd(width)}  ${c.summary}`);
  return `usage: motional <command> [arguments]

commands:
${lines.join('\n')}

Run "motional <command> --help" for a command's options.
exit status: 0 done, 1 bad input, 2 usage error
`;
}

/**
 * Run the command line.
 * @param argv arguments after the script name
 * @returns exit status
 */
export async function main(argv: string[], io: CliIo = processIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined) {
    io.err(usage());
    return EXIT_USAGE;
  }
  if (name === '-h' || name === '--help' || name === 'help') {
    io.out(usage());
    return EXIT_OK;
  }
  const entry = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!entry) {
    io.err(`motional: unknown command "${name}"\n\n${usage()}`);
    return EXIT_USAGE;
  }
  try {
    const command = await entry.load();
    return await command.run(rest, io);
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    io.err(`motional ${name}: internal error: ${message}\n`);
    if (process.env.MOTIONAL_DEBUG && e instanceof Error && e.stack) io.err(`${e.stack}\n`);
    return EXIT_BAD_INPUT;
  }
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (invokedDirectly) {
  // A closed pipe (`motional check . | head`) is not an error worth a stack trace.
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code !== 'EPIPE') throw e;
  });
  main(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
