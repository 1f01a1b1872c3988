/**
 * A small static file server for a built site (node:http), for `npm start` and tests.
 *
 * - Serves `root` under the site's base path (`/` or e.g. `/tools/crystals/`); a request
 *   outside the base gets a redirect to the base for `/` and 404 otherwise.
 * - A folder answers with its `index.html`; a folder asked for without the trailing slash is
 *   redirected to it (so relative links work). `x` also tries `x.html`.
 * - Unknown paths answer with the site's `404.html` (status 404) when it has one.
 * - Never serves anything outside `root` (decoded `..`, NUL, links leaving the folder).
 * - Binds to 127.0.0.1 by default; when the port is taken it tries the next ones.
 */
import { createReadStream } from 'node:fs';
import { realpath, stat } from 'node:fs/promises';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { extname, join, resolve, sep } from 'node:path';

/** Content types by file ending. */
export const MIME_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.htm': 'text/html; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.webmanifest': 'application/manifest+json',
  '.xml': 'application/xml; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
  '.md': 'text/markdown; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8',
  '.tsv': 'text/tab-separated-values; charset=utf-8',
  '.cir': 'text/plain; charset=utf-8',
  '.lib': 'text/plain; charset=utf-8',
  '.sp': 'text/plain; charset=utf-8',
  '.s1p': 'text/plain; charset=utf-8',
  '.s2p': 'text/plain; charset=utf-8',
  '.ts': 'text/plain; charset=utf-8',
  '.yaml': 'text/yaml; charset=utf-8',
  '.yml': 'text/yaml; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.jpg': 'image/jpeg',
  '.jpeg': 'image/jpeg',
  '.gif': 'image/gif',
  '.webp': 'image/webp',
  '.avif': 'image/avif',
  '.ico': 'image/x-icon',
  '.woff': 'font/woff',
  '.woff2': 'font/woff2',
  '.ttf': 'font/ttf',
  '.otf': 'font/otf',
  '.wasm': 'application/wasm',
  '.pdf': 'application/pdf',
  '.zip': 'application/zip',
};

/** Content type of a file name (binary fallback). */
export function contentTypeOf(path: string): string {
  return MIME_TYPES[extname(path).toLowerCase()] ?? 'application/octet-stream';
}

/** `/`, or `/a/b/`: leading and trailing slash, no doubles. */
export function normalizeBase(base: string | undefined): string {
  const parts = (base ?? '/').split('/').filter((p) => p !== '' && p !== '.');
  return parts.length === 0 ? '/' : `/${parts.join('/')}/`;
}

export interface StaticServerOptions {
  /** The built site folder. */
  root: string;
  /** Base path the site was built for. Default `/`. */
  base?: string;
  /** Default 127.0.0.1. */
  host?: string;
  /** First port to try. Default 4321; 0 picks a free one. */
  port?: number;
  /** How many following ports to try when one is taken. Default 20. */
  portAttempts?: number;
}

export interface StaticServer {
  /** The site's address, e.g. `http://127.0.0.1:4321/tools/crystals/`. */
  url: string;
  port: number;
  server: Server;
  close(): Promise<void>;
}

async function fileAt(root: string, realRoot: string, rel: string): Promise<string | undefined> {
  const path = join(root, rel);
  if (path !== root && !path.startsWith(root + sep)) return undefined;
  const st = await stat(path).catch(() => undefined);
  if (!st?.isFile()) return undefined;
  const real = await realpath(path).catch(() => undefined);
  if (!real || !real.startsWith(realRoot + sep)) return undefined;
  return real;
}

function send(res: ServerResponse, status: number, text: string, headers: Record<string, string> = {}): void {
  res.writeHead(status, { 'content-type': 'text/plain; charset=utf-8', ...headers });
  res.end(text);
}

function makeHandler(root: string, realRoot: string, base: string) {
  return async (req: IncomingMessage, res: ServerResponse): Promise<void> => {
    if (req.method !== 'GET' && req.method !== 'HEAD') return send(res, 405, 'method not allowed', { allow: 'GET, HEAD' });
    const url = new URL(req.url ?? '/', 'http://localhost');
    let pathname: string;
    try {
      pathname = decodeURIComponent(url.pathname);
    } catch {
      return send(res, 400, 'bad request');
    }
    if (pathname.includes('\0')) return send(res, 400, 'bad request');
    if (`${pathname}/` === base) return send(res, 301, '', { location: base + url.search });
    if (!pathname.startsWith(base)) {
      if (pathname === '/') return send(res, 302, '', { location: base });
      return send(res, 404, `not found (the site lives under ${base})`);
    }
    const rel = pathname.slice(base.length);
    if (rel.split('/').includes('..')) return send(res, 400, 'bad request');
    let file: string | undefined;
    if (rel === '' || rel.endsWith('/')) {
      file = await fileAt(root, realRoot, join(rel, 'index.html'));
    } else {
      file = await fileAt(root, realRoot, rel);
      if (!file) {
        const dir = await stat(join(root, rel)).catch(() => undefined);
        if (dir?.isDirectory() && (await fileAt(root, realRoot, join(rel, 'index.html')))) {
          return send(res, 301, '', { location: `${url.pathname}/${url.search}` });
        }
        file = await fileAt(root, realRoot, `${rel}.html`);
      }
    }
    let status = 200;
    if (!file) {
      file = await fileAt(root, realRoot, '404.html');
      status = 404;
      if (!file) return send(res, 404, 'not found');
    }
    const st = await stat(file);
    res.writeHead(status, { 'content-type': contentTypeOf(file), 'content-length': String(st.size), 'cache-control': 'no-cache' });
    if (req.method === 'HEAD') return void res.end();
    createReadStream(file).on('error', () => res.destroy()).pipe(res);
  };
}

function listen(server: Server, port: number, host: string): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const onError = (err: Error) => {
      server.off('listening', onListening);
      reject(err);
    };
    const onListening = () => {
      server.off('error', onError);
      const addr = server.address();
      resolvePort(typeof addr === 'object' && addr ? addr.port : port);
    };
    server.once('error', onError);
    server.once('listening', onListening);
    server.listen(port, host);
  });
}

/** Serve a built site folder. */
export async function startStaticServer(options: StaticServerOptions): Promise<StaticServer> {
  const root = resolve(options.root);
  const realRoot = await realpath(root);
  const base = normalizeBase(options.base);
  const host = options.host ?? '127.0.0.1';
  const first = options.port ?? 4321;
  const attempts = first === 0 ? 1 : Math.max(1, options.portAttempts ?? 20);
  const handler = makeHandler(root, realRoot, base);
  const server = createServer((req, res) => {
    handler(req, res).catch(() => {
      if (!res.headersSent) send(res, 500, 'internal error');
      else res.destroy();
    });
  });
  let lastError: unknown;
  for (let i = 0; i < attempts; i++) {
    try {
      const port = await listen(server, first + i, host);
      return {
        url: `http://${host}:${port}${base}`,
        port,
        server,
        close: () => new Promise((done) => {
          server.close(() => done());
          server.closeAllConnections();
        }),
      };
    } catch (err) {
      lastError = err;
      if ((err as NodeJS.ErrnoException).code !== 'EADDRINUSE') break;
    }
  }
  throw lastError instanceof Error ? lastError : new Error(`could not listen on ${host}:${first}`);
}
