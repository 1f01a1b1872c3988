/**
 * A tiny static file server for browser tests: serves a built site folder on 127.0.0.1 under a
 * base path, records every request (method, path, status), and refuses paths outside the folder.
 */
import { createReadStream, existsSync, statSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import { extname, join, normalize, resolve, sep } from 'node:path';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8', '.js': 'text/javascript; charset=utf-8', '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8', '.svg': 'image/svg+xml', '.png': 'image/png',
  '.cir': 'text/plain; charset=utf-8', '.s1p': 'text/plain; charset=utf-8', '.s2p': 'text/plain; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8', '.yaml': 'text/yaml; charset=utf-8', '.txt': 'text/plain; charset=utf-8',
};

export interface RecordedRequest {
  method: string;
  path: string;
  status: number;
}

export interface TestServer {
  /** Origin plus base path, ending in '/': http://127.0.0.1:PORT/base/ */
  url: string;
  origin: string;
  requests: RecordedRequest[];
  close(): Promise<void>;
}

/** Serve `root` under `base` (default '/') on 127.0.0.1 with a free port. */
export async function startStaticServer(root: string, base = '/'): Promise<TestServer> {
  const dir = resolve(root);
  const prefix = base.endsWith('/') ? base : `${base}/`;
  const requests: RecordedRequest[] = [];
  const server: Server = createServer((req, res) => {
    const path = (req.url ?? '/').split('?')[0];
    const send = (status: number, body = '', type = 'text/plain; charset=utf-8') => {
      requests.push({ method: req.method ?? 'GET', path: req.url ?? '', status });
      res.writeHead(status, { 'Content-Type': type });
      res.end(body);
    };
    let rel: string;
    try {
      rel = decodeURIComponent(path);
    } catch {
      return send(400, 'bad path');
    }
    if (!rel.startsWith(prefix)) return send(404, 'outside base');
    let file = normalize(join(dir, rel.slice(prefix.length)));
    if (file !== dir && !file.startsWith(dir + sep)) return send(403, 'forbidden');
    if (existsSync(file) && statSync(file).isDirectory()) {
      if (!rel.endsWith('/')) {
        requests.push({ method: req.method ?? 'GET', path: req.url ?? '', status: 301 });
        res.writeHead(301, { Location: `${path}/` });
        return res.end();
      }
      file = join(file, 'index.html');
    }
    if (!existsSync(file) || !statSync(file).isFile()) return send(404, 'not found');
    requests.push({ method: req.method ?? 'GET', path: req.url ?? '', status: 200 });
    res.writeHead(200, { 'Content-Type': TYPES[extname(file).toLowerCase()] ?? 'application/octet-stream' });
    createReadStream(file).pipe(res);
  });
  await new Promise<void>((ok, fail) => {
    server.once('error', fail);
    server.listen(0, '127.0.0.1', () => ok());
  });
  const addr = server.address();
  if (!addr || typeof addr === 'string') throw new Error('no address');
  const origin = `http://127.0.0.1:${addr.port}`;
  return {
    url: `${origin}${prefix}`,
    origin,
    requests,
    close: () => new Promise((ok) => server.close(() => ok())),
  };
}
