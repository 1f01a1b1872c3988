/**
 * `motional preview`: the catalogue served for record authors. The content folder is built into
 * a preview folder of its own (`.motional/preview/<content fingerprint>/site`) and served on
 * 127.0.0.1; every save under the content folder starts an incremental build, which extracts
 * only the changed records and renders only their pages (build-catalogue.ts), so the page shows
 * the change in a few seconds. A record with errors shows its problems (file, line, message) at
 * its page's address instead of failing (problem-pages.ts). The published build
 * (`motional build`) stays strict and atomic; nothing here touches its output.
 */
import { watch, type FSWatcher } from 'node:fs';
import { join, resolve } from 'node:path';
import { buildCatalogue, type BuildSummary } from './build-catalogue.ts';
import { sha256 } from './cache.ts';
import { PROJECT_ROOT } from './project-root.ts';
import { startStaticServer } from './static-server.ts';

export interface PreviewOptions {
  contentDir?: string;
  base?: string;
  /** First port to try (0: any free one). Default 4321. */
  port?: number;
  /** Cache folder (default the build's). */
  cacheDir?: string;
  /** Preview site folder (default under .motional/preview). */
  outDir?: string;
  /** Wait this long after the last change before building, ms (editors save in several steps). */
  settleMs?: number;
  /** Called after every build with its summary and wall time. */
  onBuild?: (summary: BuildSummary, ms: number) => void;
}

export interface Preview {
  url: string;
  outDir: string;
  /** Resolves when no build is running or pending (tests). */
  idle(): Promise<void>;
  close(): Promise<void>;
}

/** Start the preview: first build, server, watcher. */
export async function startPreview(options: PreviewOptions = {}): Promise<Preview> {
  const contentDir = resolve(options.contentDir ?? 'content');
  const outDir = resolve(
    options.outDir ?? join(PROJECT_ROOT, '.motional', 'preview', sha256(contentDir).slice(0, 16), 'site'),
  );
  const settleMs = options.settleMs ?? 60;
  let running: Promise<void> | undefined;
  let pending = false;
  let timer: NodeJS.Timeout | undefined;
  let scheduled = false;
  let closed = false;

  const buildOnce = async () => {
    const t0 = performance.now();
    const summary = await buildCatalogue({
      contentDir,
      outDir,
      base: options.base,
      cacheDir: options.cacheDir,
      problemPages: true,
      progress: false,
      log: () => undefined,
    });
    options.onBuild?.(summary, performance.now() - t0);
  };
  const run = (): Promise<void> => {
    if (running) {
      pending = true;
      return running;
    }
    running = (async () => {
      do {
        pending = false;
        await buildOnce().catch(() => undefined);
      } while (pending && !closed);
      running = undefined;
    })();
    return running;
  };

  await run();
  const server = await startStaticServer({ root: outDir, base: options.base, port: options.port ?? 4321 });
  let watcher: FSWatcher | undefined;
  try {
    watcher = watch(contentDir, { recursive: true }, () => {
      if (closed) return;
      clearTimeout(timer);
      scheduled = true;
      timer = setTimeout(() => {
        scheduled = false;
        void run();
      }, settleMs);
    });
  } catch (err) {
    await server.close();
    throw new Error(`preview: cannot watch ${contentDir}: ${(err as Error).message}`);
  }

  return {
    url: server.url,
    outDir,
    async idle() {
      while (running || scheduled) await new Promise((r) => setTimeout(r, 20));
    },
    async close() {
      closed = true;
      clearTimeout(timer);
      watcher?.close();
      await running;
      await server.close();
    },
  };
}
