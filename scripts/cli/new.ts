/**
 * `motional new FOLDER [--id ID] [--kind KIND]` (README: Commands): write a draft part.yaml
 * beside the sweep files of a folder (src/pipeline/draft-folder.ts). Prints the files it could
 * not use with the reason, the path written and what to check next. Exit 0 when written, 1 when
 * nothing was written, 2 on a usage error.
 */
import { PART_KINDS, type PartKind } from '../../src/lib/schema/part.ts';
import { draftFolder } from '../../src/pipeline/draft-folder.ts';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, parseCommandArgs, processIo, type CliIo } from './io.ts';

export const NEW_USAGE = `usage: motional new FOLDER [--id ID] [--kind KIND]

Reads every sweep file in FOLDER and writes a draft FOLDER/part.yaml: format, fixture, each
sweep's role, compensation files, added capacitance and nominal frequency inferred from the data,
each with a comment saying what to check; supplier, lot, datasheet and drive left as commented
placeholders. An existing part.yaml is never replaced.

  --id ID       part id (default: the folder's name)
  --kind KIND   ${PART_KINDS.join(' | ')} (default: inferred from fs and Q)
  -h, --help    show this help

exit status: 0 draft written, 1 nothing written, 2 usage error
`;

/** Run \`new\` with the arguments after the command name. */
export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  const parsed = parseCommandArgs(
    'new',
    args,
    { id: { type: 'string' }, kind: { type: 'string' }, help: { type: 'boolean', short: 'h' } },
    NEW_USAGE,
    io,
  );
  if (typeof parsed === 'number') return parsed;
  const v = parsed.values;
  if (parsed.positionals.length !== 1) {
    io.err(`motional new: expected one FOLDER, got ${parsed.positionals.length}\n\n${NEW_USAGE}`);
    return EXIT_USAGE;
  }
  if (v.kind !== undefined && !(PART_KINDS as readonly string[]).includes(v.kind)) {
    io.err(`motional new: --kind: expected one of ${PART_KINDS.join(', ')}, got "${v.kind}"\n`);
    return EXIT_USAGE;
  }
  const result = await draftFolder(parsed.positionals[0], { id: v.id, kind: v.kind as PartKind | undefined });
  for (const s of result.skipped) io.err(`${s.file}: not used: ${s.reason}\n`);
  if (!result.ok) {
    io.err(`motional new: ${result.message}\n`);
    return EXIT_BAD_INPUT;
  }
  const roles = result.plan.sweeps
    .map(
      (s) =>
        `${s.file} (${s.role}, ${s.fixture}${s.addedCapacitanceF !== undefined ? ', added capacitance suggested' : ''})`,
    )
    .join(', ');
  io.out(
    `wrote ${result.yamlFile}: ${result.plan.sweeps.length} sweep${result.plan.sweeps.length === 1 ? '' : 's'}: ${roles}\n`,
  );
  io.out(
    `check every "inferred" comment, fill in the placeholders, then run: motional check ${parsed.positionals[0]}\n`,
  );
  return EXIT_OK;
}
