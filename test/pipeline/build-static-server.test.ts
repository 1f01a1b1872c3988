import { mkdir, mkdtemp, rm, symlink, writeFile } from 'node:fs/promises';
import { createServer } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { normalizeBase, startStaticServer, type StaticServer } from '../../src/pipeline/static-server.ts';

let tmp: string;
let site: string;
let srv: StaticServer;

beforeAll(async () => {
  tmp = await mkdtemp(join(tmpdir(), 'motional-serve-'));
  site = join(tmp, 'site');
  await mkdir(join(site, 'parts', 'XO-1'), { recursive: true });
  await writeFile(join(site, 'index.html'), '<h1>home</h1>');
  await writeFile(join(site, '404.html'), '<h1>missing</h1>');
  await writeFile(join(site, 'parts', 'XO-1', 'index.html'), '<h1>part</h1>');
  await writeFile(join(site, 'index.json'), '[]');
  await writeFile(join(site, 'style.css'), 'body{}');
  await writeFile(join(site, 'model.cir'), '.subckt x');
  await writeFile(join(tmp, 'secret.txt'), 'secret');
  await symlink(join(tmp, 'secret.txt'), join(site, 'leak.txt'));
  srv = await startStaticServer({ root: site, base: '/tools/crystals/', port: 0 });
});
afterAll(async () => {
  await srv?.close();
  await rm(tmp, { recursive: true, force: true });
});

const get = (path: string) => fetch(new URL(path, srv.url), { redirect: 'manual' });

describe('static server', () => {
  it('normalises base paths to a leading and trailing slash', () => {
    expect(normalizeBase(undefined)).toBe('/');
    expect(normalizeBase('tools//crystals')).toBe('/tools/crystals/');
    expect(normalizeBase('/')).toBe('/');
  });

  it('serves the site under its base path with the index page of folders', async () => {
    expect(srv.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/tools\/crystals\/$/);
    const home = await get('/tools/crystals/');
    expect(home.status).toBe(200);
    expect(home.headers.get('content-type')).toBe('text/html; charset=utf-8');
    expect(await home.text()).toBe('<h1>home</h1>');
    expect(await (await get('/tools/crystals/parts/XO-1/')).text()).toBe('<h1>part</h1>');
  });

  it('redirects a folder without its trailing slash, and the root to the base', async () => {
    const r = await get('/tools/crystals/parts/XO-1');
    expect(r.status).toBe(301);
    expect(r.headers.get('location')).toBe('/tools/crystals/parts/XO-1/');
    const root = await get('/');
    expect(root.status).toBe(302);
    expect(root.headers.get('location')).toBe('/tools/crystals/');
  });

  it('sends content types by file ending', async () => {
    // MIME types: IANA media type registry (RFC 8259 for JSON, RFC 9239 for JavaScript/CSS text types)
    expect((await get('/tools/crystals/index.json')).headers.get('content-type')).toBe('application/json; charset=utf-8');
    expect((await get('/tools/crystals/style.css')).headers.get('content-type')).toBe('text/css; charset=utf-8');
    expect((await get('/tools/crystals/model.cir')).headers.get('content-type')).toBe('text/plain; charset=utf-8');
  });

  it('answers unknown paths with the site 404 page, and nothing outside the site', async () => {
    const missing = await get('/tools/crystals/nope');
    expect(missing.status).toBe(404);
    expect(await missing.text()).toBe('<h1>missing</h1>');
    expect((await get('/index.html')).status).toBe(404);
    // an encoded slash survives URL normalisation and decodes to '../secret.txt'
    expect((await get('/tools/crystals/%2e%2e%2fsecret.txt')).status).toBe(400);
    expect(await (await get('/tools/crystals/%2e%2e/%2e%2e/secret.txt')).text()).not.toContain('secret');
    const leak = await get('/tools/crystals/leak.txt');
    expect(leak.status).toBe(404);
    expect(await leak.text()).not.toContain('secret');
  });

  it('moves to the next port when the first one is taken', async () => {
    const blocker = createServer();
    await new Promise<void>((r) => blocker.listen(0, '127.0.0.1', () => r()));
    const taken = (blocker.address() as { port: number }).port;
    const next = await startStaticServer({ root: site, port: taken });
    try {
      expect(next.port).toBeGreaterThan(taken);
      expect(next.url).toBe(`http://127.0.0.1:${next.port}/`);
    } finally {
      await next.close();
      await new Promise<void>((r) => blocker.close(() => r()));
    }
  });
});
