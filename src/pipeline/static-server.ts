/**
 * The preview server of a built site, for `npm start` and tests: sirv serves the files,
 * node:http listens.
 *
 * - The site lives under its base path (`/` or e.g. `/tools/crystals/`). `/` and the base
 *   without its trailing slash are redirected to the base; these are the only redirects, and
 *   their Location is the base itself, never text taken from the request. Other paths outside
 *   the base answer 404.
 * - Under the base, `x/`, `x` and `x.html` answer with the page; unknown paths and hidden
 *   files answer with the site's `404.html`, status 404.
 * - Paths with `.` or `..` segments, backslashes, NUL or broken percent-encoding are refused
 *   (400) before any file is looked up; sirv itself never leaves the folder.
 * - Binds to 127.0.0.1 by default; when the port is taken it tries the next ones.
 */
import { readFile } from 'node:fs/promises';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { extname, join, resolve } from 'node:path';
import sirv from 'sirv';

/**
 * Content types of the catalogue's download files that sirv does not know or reads otherwise
 * (`.ts` is a Touchstone file here, not an MPEG stream).
 */
const DOWNLOAD_TYPES: Readonly<Record<string, string>> = {
  '.cir': 'text/plain; charset=utf-8',
  '.lib': 'text/plain; charset=utf-8',
  '.sp': 'text/plain; charset=utf-8',
  '.s1p': 'text/plain; charset=utf-8',
  '.s2p': 'text/plain; charset=utf-8',
  '.ts': 'text/plain; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8',
  '.tsv': 'text/tab-separated-values; charset=utf-8',
  '.yaml': 'text/yaml; charset=utf-8',
  '.yml': 'text/yaml; charset=utf-8',
  '.md': 'text/markdown; charset=utf-8',
};

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

/** Why a request path is refused, or undefined when it may be looked up. */
export function refusePath(pathname: string): string | undefined {
  let decoded: string;
  try {
    decoded = decodeURIComponent(pathname);
  } catch {
    return 'broken percent-encoding';
  }
  if (decoded.includes('\0')) return 'NUL character';
  if (decoded.includes('\\')) return 'backslash';
  if (decoded.split('/').some((s) => s === '.' || s === '..')) return '"." or ".." segment';
  return undefined;
}

/**
 * Give sirv the request's decoded path under the base. sirv decodes with decodeURI, which keeps
 * reserved characters encoded (`%23` `#`, `%26` `&`, `%3F` `?`, …), so a download whose name holds
 * one would not be found. Its URL parser (@polka/url) memoises the parsed URL on
 * `req._parsedUrl`; that memo is set here to the decoded path, with `%` escaped once for
 * sirv's own decodeURI.
 */
function handOver(req: IncomingMessage, decodedPath: string): void {
  const pathname = decodedPath.replaceAll('%', '%25');
  req.url = pathname;
  Object.assign(req, { _parsedUrl: { pathname, search: '', query: undefined, hash: undefined, raw: pathname } });
}

function sendText(res: ServerResponse, status: number, text: string, headers: Record<string, string> = {}): void {
  res.writeHead(status, { 'content-type': 'text/plain; charset=utf-8', ...headers });
  res.end(text);
}

/** The site's own 404 page, read per request so a rebuild shows at once. */
async function sendNotFoundPage(root: string, res: ServerResponse): Promise<void> {
  const page = await readFile(join(root, '404.html')).catch(() => undefined);
  if (!page) return sendText(res, 404, 'not found (the site has no 404.html)');
  res.writeHead(404, {
    'content-type': 'text/html; charset=utf-8',
    'content-length': String(page.length),
    'cache-control': 'no-cache',
  });
  res.end(page);
}

function makeHandler(root: string, base: string) {
  const serveFile = sirv(root, {
    dev: true, // look files up on every request: a rebuild is served without a restart
    etag: true,
    extensions: ['html'],
    setHeaders: (res, pathname) => {
      const type = pathname.endsWith('/') ? undefined : DOWNLOAD_TYPES[extname(pathname).toLowerCase()];
      if (type) res.setHeader('content-type', type);
    },
  });
  return (req: IncomingMessage, res: ServerResponse): void => {
    if (req.method !== 'GET' && req.method !== 'HEAD')
      return sendText(res, 405, 'method not allowed', { allow: 'GET, HEAD' });
    const pathname = (req.url ?? '/').split(/[?#]/, 1)[0];
    const refusal = refusePath(pathname);
    if (refusal) return sendText(res, 400, `bad request path: ${refusal}`);
    if (pathname === '/' && base !== '/') return sendText(res, 302, '', { location: base });
    if (`${pathname}/` === base) return sendText(res, 301, '', { location: base });
    if (!pathname.startsWith(base)) return sendText(res, 404, `not found (the site lives under ${base})`);
    const rest = decodeURIComponent(`/${pathname.slice(base.length)}`).replace(/\/{2,}/g, '/');
    if (rest.split('/').some((s) => s.startsWith('.'))) return void sendNotFoundPage(root, res);
    // sirv reads a Range header loosely (an end before the start throws); a preview needs none
    delete req.headers.range;
    handOver(req, rest);
    serveFile(req, res, () => sendNotFoundPage(root, res));
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
  const base = normalizeBase(options.base);
  // the base is the Location of the redirects: a backslash would make it leave the site
  if (/[\\?#\s\0]/.test(base))
    throw new Error(
      `static server: base path "${options.base}" may not hold a backslash, "?", "#", NUL or white space`,
    );
  const host = options.host ?? '127.0.0.1';
  const first = options.port ?? 4321;
  const attempts = first === 0 ? 1 : Math.max(1, options.portAttempts ?? 20);
  const handler = makeHandler(root, base);
  const server = createServer((req, res) => {
    try {
      handler(req, res);
    } catch (err) {
      if (!res.headersSent) sendText(res, 500, `internal error serving ${req.url}: ${(err as Error).message}`);
      else res.destroy();
    }
  });
  let lastError: unknown;
  for (let i = 0; i < attempts; i++) {
    try {
      const port = await listen(server, first + i, host);
      return {
        url: `http://${host}:${port}${base}`,
        port,
        server,
        close: () =>
          new Promise((done) => {
            server.close(() => done());
            server.closeAllConnections();
          }),
      };
    } catch (err) {
      lastError = err;
      if ((err as NodeJS.ErrnoException).code !== 'EADDRINUSE') break;
    }
  }
  const last = first + attempts - 1;
  const why = lastError instanceof Error ? lastError.message : String(lastError);
  throw new Error(`static server: could not listen on ${host} port ${first}${last > first ? `–${last}` : ''}: ${why}`);
}
