import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { createServer, request, type IncomingHttpHeaders, type Server } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { normalizeBase, refusePath, startStaticServer, type StaticServer } from '../../src/pipeline/static-server.ts';

const CANARY = 'canary-outside-the-site-4e1f';
const NOT_FOUND_PAGE = '<h1>page not found</h1>';
/** Sweep file names a record may hold: reserved URL characters, a literal percent sign, non-ASCII. */
const ODD_NAMES = [
  "a1 narrow & 'q' #1 {{7*7}}.s1p",
  'a1 wide $(id) %3Cb%3E;.csv',
  'why?+=,@:.txt',
  '100% drive.ts',
  'größe.s2p',
];

let tmp: string;
let site: string;
let underBase: StaticServer;
let atRoot: StaticServer;

beforeAll(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'motional-serve-'));
  site = join(tmp, 'site');
  await mkdir(join(site, 'compare'), { recursive: true });
  await mkdir(join(site, '_astro'));
  await mkdir(join(site, 'downloads', 'XO-1'), { recursive: true });
  await writeFile(join(site, 'index.html'), '<h1>home</h1>');
  await writeFile(join(site, 'compare', 'index.html'), '<h1>compare</h1>');
  await writeFile(join(site, '404.html'), NOT_FOUND_PAGE);
  await writeFile(join(site, '_astro', 'app.js'), 'console.log(1);');
  await writeFile(join(site, 'downloads', 'XO-1', 'model.cir'), '.subckt x');
  await writeFile(join(site, 'downloads', 'XO-1', 'a1.ts'), '# Hz S RI R 50');
  await writeFile(join(site, '.motional-output'), 'marker');
  for (const name of ODD_NAMES) await writeFile(join(site, 'downloads', 'XO-1', name), `file ${name}`);
  // next to the served folder: none of this may ever come back
  await writeFile(join(tmp, 'canary.txt'), CANARY);
  await mkdir(join(tmp, 'site-other'));
  await writeFile(join(tmp, 'site-other', 'canary.txt'), CANARY);
  underBase = await startStaticServer({ root: site, base: '/base/', port: 0 });
  atRoot = await startStaticServer({ root: site, port: 0 });
});
afterAll(async () => {
  await underBase?.close();
  await atRoot?.close();
  await rm(tmp, { recursive: true, force: true });
});

interface RawResponse {
  status: number;
  headers: IncomingHttpHeaders;
  body: string;
}

/** One request with the path sent exactly as given (fetch and URL would normalise it). */
function rawRequest(
  port: number,
  path: string,
  options: { method?: string; headers?: Record<string, string> } = {},
): Promise<RawResponse> {
  return new Promise((resolveResponse, reject) => {
    const req = request(
      { host: '127.0.0.1', port, path, method: options.method ?? 'GET', headers: options.headers, agent: false },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () =>
          resolveResponse({
            status: res.statusCode ?? 0,
            headers: res.headers,
            body: Buffer.concat(chunks).toString('utf8'),
          }),
        );
        res.on('error', reject);
      },
    );
    req.on('error', reject);
    req.end();
  });
}

const HOSTILE_PATHS = [
  '//evil.example/x',
  '//evil.example',
  '//evil.example/',
  '/.//compare',
  '/.//compare/',
  '/base/.//compare',
  '/base//evil.example',
  '/%2e%2e/',
  '/%2e%2e/%2e%2e/etc/passwd',
  '/..%2f..%2fetc/passwd',
  '/base/%2e%2e/canary.txt',
  '/base/%2e%2e%2fcanary.txt',
  '/base/..%2fcanary.txt',
  '/base/../canary.txt',
  '/base/../site-other/canary.txt',
  '/%2e%2e/canary.txt',
  '/%2e%2e%2fsite-other%2fcanary.txt',
  '/%2f%2fevil.example/',
  '/%2fevil.example',
  '/base/%2f%2fevil.example/',
  '/%5cevil.example',
  '/%5c%5cevil.example/',
  '/\\evil.example',
  '/\\\\evil.example/',
  '/base/\\\\evil.example/',
  '/base/\\evil.example',
  `/${'a'.repeat(10_000)}`,
  `/base/${'a/'.repeat(5_000)}`,
  '/%00',
  '/base/%00',
  '/base/index.html%00.js',
  '/base/%',
];

describe('static server: hostile request paths', () => {
  for (const [name, srv] of [
    ['under a base', () => underBase],
    ['at the root', () => atRoot],
  ] as const) {
    it.each(HOSTILE_PATHS)(`${name}: %s neither redirects off the site nor leaks files`, async (path) => {
      const res = await rawRequest(srv().port, path);
      expect(res.status, path).toBeGreaterThanOrEqual(400);
      expect(res.status, path).toBeLessThan(500);
      const location = res.headers.location;
      if (location !== undefined) expect(location, path).toMatch(/^\/[^/\\]/);
      expect(res.body, path).not.toContain(CANARY);
      expect(res.body, path).not.toMatch(/^root:/m);
    });
  }

  it('refuses dot segments, backslashes, NUL and broken encoding with a reason', async () => {
    const res = await rawRequest(atRoot.port, '/.//compare');
    expect(res.status).toBe(400);
    expect(res.headers.location).toBeUndefined();
    expect(res.body).toBe('bad request path: "." or ".." segment');
    expect(refusePath('/a/%2e%2e/b')).toBe('"." or ".." segment');
    expect(refusePath('/a%5cb')).toBe('backslash');
    expect(refusePath('/a%00')).toBe('NUL character');
    expect(refusePath('/a%zz')).toBe('broken percent-encoding');
    expect(refusePath('/parts/XO-1.5/')).toBeUndefined();
  });
});

describe('static server: base path, pages and 404', () => {
  it('normalises base paths to a leading and trailing slash', () => {
    expect(normalizeBase(undefined)).toBe('/');
    expect(normalizeBase('tools//crystals')).toBe('/tools/crystals/');
    expect(normalizeBase('/')).toBe('/');
  });

  it('serves the site under its base, a folder with or without its trailing slash', async () => {
    expect(underBase.url).toBe(`http://127.0.0.1:${underBase.port}/base/`);
    const home = await rawRequest(underBase.port, '/base/');
    expect(home.status).toBe(200);
    expect(home.headers['content-type']).toMatch(/^text\/html/);
    expect(home.body).toBe('<h1>home</h1>');
    for (const path of ['/base/compare/', '/base/compare', '/base/compare/?parts=XO-1,XO-2', '/base//compare/']) {
      const page = await rawRequest(underBase.port, path);
      expect(page.status, path).toBe(200);
      expect(page.body, path).toBe('<h1>compare</h1>');
    }
    const atRootHome = await rawRequest(atRoot.port, '/');
    expect(atRootHome.body).toBe('<h1>home</h1>');
  });

  it('redirects only the root and the bare base, both to the base', async () => {
    const root = await rawRequest(underBase.port, '/');
    expect(root.status).toBe(302);
    expect(root.headers.location).toBe('/base/');
    const bare = await rawRequest(underBase.port, '/base');
    expect(bare.status).toBe(301);
    expect(bare.headers.location).toBe('/base/');
  });

  it('refuses a base path that could lead a redirect off the site', async () => {
    await expect(startStaticServer({ root: site, base: '\\evil.example', port: 0 })).rejects.toThrow(
      'static server: base path "\\evil.example" may not hold a backslash, "?", "#", NUL or white space',
    );
  });

  it('answers paths outside the base with 404', async () => {
    const outside = await rawRequest(underBase.port, '/index.html');
    expect(outside.status).toBe(404);
    expect(outside.body).toBe('not found (the site lives under /base/)');
  });

  it('answers unknown and hidden paths with the site 404 page, status 404', async () => {
    for (const path of ['/base/nope', '/base/parts/XO-9/', '/base/.motional-output']) {
      const res = await rawRequest(underBase.port, path);
      expect(res.status, path).toBe(404);
      expect(res.headers['content-type'], path).toBe('text/html; charset=utf-8');
      expect(res.body, path).toBe(NOT_FOUND_PAGE);
    }
    const head = await rawRequest(underBase.port, '/base/nope', { method: 'HEAD' });
    expect(head.status).toBe(404);
    expect(head.body).toBe('');
  });

  it('sends assets and downloads with their content types', async () => {
    const js = await rawRequest(underBase.port, '/base/_astro/app.js');
    expect(js.status).toBe(200);
    expect(js.headers['content-type']).toMatch(/^text\/javascript/);
    expect(js.body).toBe('console.log(1);');
    // a Touchstone .ts file is text, not an MPEG transport stream (video/mp2t)
    for (const file of ['model.cir', 'a1.ts']) {
      const res = await rawRequest(underBase.port, `/base/downloads/XO-1/${file}`);
      expect(res.status, file).toBe(200);
      expect(res.headers['content-type'], file).toBe('text/plain; charset=utf-8');
    }
  });

  it('serves downloads whose names hold reserved characters, percent signs or non-ASCII letters', async () => {
    for (const name of ODD_NAMES) {
      const res = await rawRequest(underBase.port, `/base/downloads/XO-1/${encodeURIComponent(name)}`);
      expect(res.status, name).toBe(200);
      expect(res.body, name).toBe(`file ${name}`);
    }
    // a percent sign is a file name character only when encoded: '%3Cb%3E' names '<b>'
    const decodedOnce = await rawRequest(
      underBase.port,
      `/base/downloads/XO-1/${encodeURIComponent('a1 wide $(id) <b>;.csv')}`,
    );
    expect(decodedOnce.status).toBe(404);
  });

  it('answers other methods with 405 and ignores byte ranges', async () => {
    const post = await rawRequest(underBase.port, '/base/', { method: 'POST' });
    expect(post.status).toBe(405);
    expect(post.headers.allow).toBe('GET, HEAD');
    // an end before the start would make the file stream throw
    const ranged = await rawRequest(underBase.port, '/base/_astro/app.js', { headers: { range: 'bytes=10-5' } });
    expect(ranged.status).toBe(200);
    expect(ranged.body).toBe('console.log(1);');
  });
});

describe('static server: port', () => {
  const listenOn = (port: number): Promise<Server> =>
    new Promise((resolveServer, reject) => {
      const s = createServer();
      s.once('error', reject);
      s.listen(port, '127.0.0.1', () => resolveServer(s));
    });
  const closeServer = (s: Server) => new Promise<void>((done) => s.close(() => done()));

  it('moves to the next port when the first one is taken', async () => {
    const blocker = await listenOn(0);
    const taken = (blocker.address() as { port: number }).port;
    // make sure the next port is free just before, so the expectation can be exact
    await closeServer(await listenOn(taken + 1));
    const next = await startStaticServer({ root: site, base: '/base/', port: taken });
    try {
      expect(next.port).toBe(taken + 1);
      expect(next.url).toBe(`http://127.0.0.1:${taken + 1}/base/`);
      expect((await rawRequest(next.port, '/base/')).body).toBe('<h1>home</h1>');
    } finally {
      await next.close();
      await closeServer(blocker);
    }
  });

  it('says which ports it tried when all are taken', async () => {
    const blocker = await listenOn(0);
    const taken = (blocker.address() as { port: number }).port;
    try {
      await expect(startStaticServer({ root: site, port: taken, portAttempts: 1 })).rejects.toThrow(
        `static server: could not listen on 127.0.0.1 port ${taken}: listen EADDRINUSE`,
      );
    } finally {
      await closeServer(blocker);
    }
  });
});
