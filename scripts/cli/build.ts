/**
 * `motional build [--content DIR] [--out DIR] [--base PATH] [--jobs N] [--no-cache]`
 * (README: Commands): validate every record, extract, emit the catalogue data and build the site
 * into DIR, replacing it atomically. Problems go to stderr as `FILE:LINE: message`, the summary
 * to stdout. Exit 0 built, 1 any invalid record or a failed build (DIR untouched), 2 usage.
 */
import { writeFile } from 'node:fs/promises';
import {
  buildCatalogue,
  formatIssues,
  formatSummary,
  type BuildCatalogueOptions,
} from '../../src/pipeline/build-catalogue.ts';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, processIo, type CliIo } from './io.ts';

export const BUILD_USAGE = `usage: motional build [--content DIR] [--out DIR] [--base PATH] [--jobs N] [--no-cache]

Validates every part record, extracts the parameters and builds the static catalogue site.
The output folder is replaced only when everything succeeded.

  --content DIR   folder of part folders, with oscillators.yaml (default: content)
  --out DIR       output folder (default: dist)
  --base PATH     serve the site from this sub-path, e.g. /tools/crystals/ (default: /)
  --jobs N        worker threads for extraction (default: one per core; 1 = no threads)
  --no-cache      extract every record again instead of reusing earlier results
  --keep-data DIR also keep the emitted catalogue data (JSON, downloads) in DIR
  --cache-dir DIR extraction cache folder (default: .motional/cache)
  --summary FILE  also write the build summary as JSON to FILE
  --data-only     emit the catalogue data into the output folder, without the site
  --full-site     render every page, even when only some parts changed since the last build
  --quiet         no progress display
  -h, --help      show this help

exit status: 0 built, 1 any invalid record or failed build (output left as it was), 2 usage error
`;

/** Parsed options, or a usage message. */
export function parseBuildArgs(
  args: string[],
): { options: BuildCatalogueOptions; quiet: boolean; summaryFile?: string } | { usage: string } | { help: true } {
  const options: BuildCatalogueOptions = {};
  let quiet = false;
  let summaryFile: string | undefined;
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    const [flag, inline] =
      arg.startsWith('--') && arg.includes('=')
        ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)]
        : [arg, undefined];
    const value = (): string | undefined => (inline !== undefined ? inline : args[++i]);
    switch (flag) {
      case '-h':
      case '--help':
        return { help: true };
      case '--content':
      case '--out':
      case '--base':
      case '--jobs':
      case '--keep-data':
      case '--cache-dir':
      case '--summary': {
        const v = value();
        if (v === undefined || v === '') return { usage: `${flag} needs a value` };
        if (flag === '--content') options.contentDir = v;
        else if (flag === '--out') options.outDir = v;
        else if (flag === '--base') {
          if (!v.startsWith('/') || /[?#\\]/.test(v))
            return { usage: `--base expects a path starting with '/', e.g. /tools/crystals/, got "${v}"` };
          options.base = v;
        } else if (flag === '--keep-data') options.keepDataDir = v;
        else if (flag === '--cache-dir') options.cacheDir = v;
        else if (flag === '--summary') summaryFile = v;
        else {
          const n = Number(v);
          if (!Number.isInteger(n) || n < 1 || n > 256)
            return { usage: `--jobs expects a whole number from 1 to 256, got "${v}"` };
          options.jobs = n;
        }
        break;
      }
      case '--no-cache':
        options.cache = false;
        break;
      case '--data-only':
        options.dataOnly = true;
        break;
      case '--full-site':
        options.fullSite = true;
        break;
      case '--quiet':
        quiet = true;
        break;
      default:
        return { usage: arg.startsWith('-') ? `unknown option "${arg}"` : `unexpected argument "${arg}"` };
    }
  }
  return { options, quiet, summaryFile };
}

/** Run `build` with the arguments after the command name. */
export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  const parsed = parseBuildArgs(args);
  if ('help' in parsed) {
    io.out(BUILD_USAGE);
    return EXIT_OK;
  }
  if ('usage' in parsed) {
    io.err(`motional build: ${parsed.usage}\n\n${BUILD_USAGE}`);
    return EXIT_USAGE;
  }
  const controller = new AbortController();
  const stop = () => controller.abort();
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
  try {
    const progress = parsed.quiet
      ? false
      : io === processIo
        ? process.stderr
        : { write: (t: string) => io.err(t), isTTY: false };
    const summary = await buildCatalogue({
      ...parsed.options,
      progress,
      log: (t) => io.err(t),
      signal: controller.signal,
    });
    io.err(formatIssues(summary.issues));
    io.out(formatSummary(summary));
    if (parsed.summaryFile)
      await writeFile(
        parsed.summaryFile,
        `${JSON.stringify({ ...summary, issues: summary.issues.length }, null, 2)}\n`,
      );
    return summary.exitCode === 0 ? EXIT_OK : EXIT_BAD_INPUT;
  } finally {
    process.off('SIGINT', stop);
    process.off('SIGTERM', stop);
  }
}
