// Entry of every worker-pool thread (plain JavaScript: it runs before any TypeScript loader).
// The worker module's URL is the thread's first argument; a `.ts` module is loaded through
// tsx's ESM hooks, registered through tsx's public API.
const moduleUrl = process.argv[2];
if (!moduleUrl) throw new Error('worker-bootstrap.mjs: no worker module URL given as the first argument');
if (new URL(moduleUrl).pathname.endsWith('.ts')) {
  const { register } = await import('tsx/esm/api');
  register();
}
await import(moduleUrl);
