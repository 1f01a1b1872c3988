/**
 * The site's preview server for browser tests: serves a built site folder on 127.0.0.1 with a
 * free port under a base path, and records every request (method, path as sent, status).
 */
import { startStaticServer as startPreviewServer } from '../../src/pipeline/static-server.ts';

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
  const preview = await startPreviewServer({ root, base, port: 0 });
  const requests: RecordedRequest[] = [];
  // before the server's own handler, which rewrites req.url for the file lookup
  preview.server.prependListener('request', (req, res) => {
    const method = req.method ?? 'GET';
    const path = req.url ?? '';
    res.once('finish', () => requests.push({ method, path, status: res.statusCode }));
  });
  return {
    url: preview.url,
    origin: `http://127.0.0.1:${preview.port}`,
    requests,
    close: () => preview.close(),
  };
}
