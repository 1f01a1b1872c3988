/**
 * `npm start`: build the demo catalogue (content/ → dist/), then serve dist/ on 127.0.0.1 and
 * print the address. Port from env PORT (default 4321; the next free one when taken).
 *
 * Options (after `npm start --`): the build's own (`--content`, `--out`, `--base`, `--jobs`,
 * `--no-cache`, `--quiet`), plus `--no-build` to serve what is already built.
 * Stop with Ctrl-C.
 */
import { existsSync } from 'node:fs';
import { buildCatalogue, formatIssues, formatSummary } from '../src/pipeline/build-catalogue.ts';
import { startStaticServer } from '../src/pipeline/static-server.ts';
import { parseBuildArgs } from './cli/build.ts';

async function main(argv: string[]): Promise<number> {
  const noBuild = argv.includes('--no-build');
  const parsed = parseBuildArgs(argv.filter((a) => a !== '--no-build'));
  if ('help' in parsed || 'usage' in parsed) {
    if ('usage' in parsed) process.stderr.write(`start: ${parsed.usage}\n`);
    process.stderr.write(
      'usage: npm start -- [--no-build] [build options; see "npm run -s motional -- build --help"]\n',
    );
    return 'help' in parsed ? 0 : 2;
  }
  const options = parsed.options;
  const outDir = options.outDir ?? 'dist';
  if (!noBuild) {
    const summary = await buildCatalogue({ ...options, progress: parsed.quiet ? false : process.stderr });
    process.stderr.write(formatIssues(summary.issues));
    process.stdout.write(formatSummary(summary));
    if (summary.exitCode !== 0) {
      if (!existsSync(outDir)) return 1;
      process.stderr.write(`serving the previous build in ${outDir}\n`);
    }
  } else if (!existsSync(outDir)) {
    process.stderr.write(`start: ${outDir} does not exist; run without --no-build first\n`);
    return 1;
  }
  const envPort = process.env.PORT;
  const port = envPort !== undefined && envPort !== '' ? Number(envPort) : 4321;
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    process.stderr.write(`start: PORT must be a whole number from 0 to 65535, got "${envPort}"\n`);
    return 2;
  }
  const server = await startStaticServer({ root: outDir, base: options.base, port });
  process.stdout.write(`\ncatalogue served at ${server.url}  (Ctrl-C to stop)\n`);
  await new Promise<void>((resolveStop) => {
    const stop = () => resolveStop();
    process.once('SIGINT', stop);
    process.once('SIGTERM', stop);
  });
  await server.close();
  return 0;
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (err) => {
    process.stderr.write(`start: ${(err as Error).stack ?? err}\n`);
    process.exitCode = 1;
  },
);
