/**
 * `motional check PATH...` (README: Commands): validate part records and every file they name.
 * Prints each issue as `FILE:LINE: message` on stderr (warnings marked `warning:`), then a
 * one-line summary on stdout. Exit 0 when there is no error (warnings allowed), 1 when there
 * is any error, 2 on a usage error.
 */
import { formatIssue } from '../../src/lib/issues.ts';
import { checkPaths } from '../../src/pipeline/check-paths.ts';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, processIo, type CliIo } from './io.ts';

export const CHECK_USAGE = `usage: motional check [--no-warnings] PATH...

Validates part records and every sweep file they name. PATH is a part.yaml, a part folder,
or a folder of part folders (searched recursively).

  --no-warnings   print errors only (warnings never change the exit status)
  -h, --help      show this help

exit status: 0 all valid, 1 any problem, 2 usage error
`;

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** Run `check` with the arguments after the command name. */
export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  const paths: string[] = [];
  let warnings = true;
  let optionsDone = false;
  for (const arg of args) {
    if (optionsDone || !arg.startsWith('-') || arg === '-') paths.push(arg);
    else if (arg === '--') optionsDone = true;
    else if (arg === '-h' || arg === '--help') {
      io.out(CHECK_USAGE);
      return EXIT_OK;
    } else if (arg === '--no-warnings') warnings = false;
    else {
      io.err(`motional check: unknown option "${arg}"\n\n${CHECK_USAGE}`);
      return EXIT_USAGE;
    }
  }
  if (paths.length === 0) {
    io.err(`motional check: expected at least one PATH\n\n${CHECK_USAGE}`);
    return EXIT_USAGE;
  }

  const result = await checkPaths(paths);
  let errorCount = 0;
  let warningCount = 0;
  for (const issue of result.issues) {
    if (issue.severity === 'error') errorCount++;
    else warningCount++;
    if (issue.severity === 'error' || warnings) io.err(`${formatIssue(issue)}\n`);
  }
  const tail = warningCount > 0 ? `, ${plural(warningCount, 'warning')}` : '';
  io.out(`${plural(result.parts.length, 'part')}, ${plural(errorCount, 'problem')}${tail}\n`);
  return errorCount > 0 ? EXIT_BAD_INPUT : EXIT_OK;
}
