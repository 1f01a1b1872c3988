/**
 * `motional preview [--content DIR] [--base PATH] [--port N]` (README: Adding a part): serve the
 * catalogue for record authors and rebuild what changed on every save; a record's problems show
 * on its page instead of failing. Runs until Ctrl-C. See src/pipeline/preview.ts.
 */
import { formatIssue } from '../../src/lib/issues.ts';
import { startPreview } from '../../src/pipeline/preview.ts';
import { EXIT_OK, EXIT_USAGE, processIo, type CliIo } from './io.ts';

export const PREVIEW_USAGE = `usage: motional preview [--content DIR] [--base PATH] [--port N]

Serves the catalogue on 127.0.0.1 while you edit records: every save rebuilds only what changed,
and a record with errors shows them on its page (file, line, message). The published build
(motional build) stays strict.

  --content DIR   folder of part folders (default: content)
  --base PATH     serve under this sub-path (default: /)
  --port N        first port to try (default: env PORT, else 4321)
`;

export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  let contentDir: string | undefined;
  let base: string | undefined;
  let port = process.env.PORT ? Number(process.env.PORT) : 4321;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '-h' || a === '--help') {
      io.out(PREVIEW_USAGE);
      return EXIT_OK;
    }
    const v = args[i + 1];
    if ((a === '--content' || a === '--base' || a === '--port') && (v === undefined || v === '')) {
      io.err(`preview: ${a} needs a value\n${PREVIEW_USAGE}`);
      return EXIT_USAGE;
    }
    if (a === '--content') contentDir = args[++i];
    else if (a === '--base') base = args[++i];
    else if (a === '--port') port = Number(args[++i]);
    else {
      io.err(`preview: unknown option "${a}"\n${PREVIEW_USAGE}`);
      return EXIT_USAGE;
    }
  }
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    io.err(`preview: the port must be a whole number from 0 to 65535, got "${port}"\n`);
    return EXIT_USAGE;
  }
  const preview = await startPreview({
    contentDir,
    base,
    port,
    onBuild: (s, ms) => {
      const problems = s.issues.filter((i) => i.severity === 'error');
      io.out(
        `${new Date().toISOString().slice(11, 19)} built ${s.partsPublished} parts in ${(ms / 1000).toFixed(1)} s${problems.length ? `; ${problems.length} problems:` : ''}\n`,
      );
      for (const p of problems) io.out(`  ${formatIssue(p)}\n`);
      if (s.failure && s.partsPublished === 0) io.out(`  build failed: ${s.failure}\n`);
    },
  });
  io.out(`preview served at ${preview.url}  (Ctrl-C to stop)\n`);
  await new Promise<void>((stop) => {
    process.once('SIGINT', () => stop());
    process.once('SIGTERM', () => stop());
  });
  await preview.close();
  return EXIT_OK;
}
