/**
 * `motional extract PART [--json] [--sample ID]` (README: Commands).
 *
 * Loads the part record and its sweeps, extracts every sample and prints either the fixed
 * extract JSON (SI base units: `part`, `samples[].sample`, `c0F`, `modes[]` with `overtone`,
 * `spurious`, `fsHz`, `fpHz`, `r1Ohm`, `l1H`, `c1F`, `q`, `uncertainty`, and `warnings`, plus
 * the engine's extra fields) or a readable table. Problems with the input are printed as
 * `FILE:LINE: message` on stderr.
 * Exit: 0 done (warnings allowed), 1 bad input (invalid record, or no mode could be
 * extracted from any sample), 2 usage.
 */
import { formatIssue, type Issue } from '../../src/lib/issues.ts';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import { formatExtractText } from '../../src/lib/extract/format-text.ts';
import type { PartResult } from '../../src/lib/extract/types.ts';
import { loadPart } from '../../src/pipeline/load-part.ts';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, parseCommandArgs, processIo, type CliIo } from './io.ts';

export const EXTRACT_USAGE = `usage: motional extract PART [--json] [--sample ID]

Extract the motional parameters (C0; fs, fp, R1, L1, C1, Q per mode) of every sample of a part,
with uncertainties, cross-checks between methods and measurement diagnostics.
PART is a part.yaml or its folder.

options:
  --json        print the result as JSON (SI base units) instead of a table
  --sample ID   only this sample
  -h, --help    this text

exit status: 0 done (warnings allowed), 1 bad input, 2 usage error
`;

/** JSON with every non-finite number replaced by null (the engine never produces one). */
export function resultJson(result: PartResult): string {
  return `${JSON.stringify(result, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`;
}

/** Run `extract` with the arguments after the command name. */
export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  const parsed = parseCommandArgs(
    'extract',
    args,
    { json: { type: 'boolean' }, sample: { type: 'string' }, help: { type: 'boolean', short: 'h' } },
    EXTRACT_USAGE,
    io,
  );
  if (typeof parsed === 'number') return parsed;
  const { values: v, positionals } = parsed;
  if (positionals.length !== 1) {
    io.err(`motional extract: expected one PART, got ${positionals.length}\n\n${EXTRACT_USAGE}`);
    return EXIT_USAGE;
  }

  const loaded = await loadPart(positionals[0]);
  for (const issue of loaded.issues) io.err(`${formatIssue(issue)}\n`);
  if (!loaded.part || loaded.issues.some((i) => i.severity === 'error')) return EXIT_BAD_INPUT;
  const part = loaded.part;
  if (v.sample !== undefined && !part.samples.some((s) => s.id === v.sample)) {
    io.err(
      `${formatIssue({ severity: 'error', file: loaded.yamlFile, message: `no sample "${v.sample}" (samples: ${part.samples.map((s) => s.id).join(', ')})` })}\n`,
    );
    return EXIT_BAD_INPUT;
  }
  const chosen = v.sample === undefined ? part : { ...part, samples: part.samples.filter((s) => s.id === v.sample) };
  const result = extractPart(chosen, loaded.sweeps);

  // Errors found while extracting, located at the sweep file they concern when there is one.
  const fileOf = new Map(loaded.sweeps.map((s) => [s.ref.file, s.file]));
  for (const s of result.samples) {
    for (const d of s.diagnostics) {
      if (d.severity !== 'error') continue;
      const issue: Issue = {
        severity: 'error',
        file: (d.sweep && fileOf.get(d.sweep)) || loaded.yamlFile,
        message: `sample ${s.sample}: ${d.message}`,
      };
      io.err(`${formatIssue(issue)}\n`);
    }
  }
  io.out(v.json ? resultJson(result) : formatExtractText(result));
  return result.samples.some((s) => s.modes.length > 0) ? EXIT_OK : EXIT_BAD_INPUT;
}
