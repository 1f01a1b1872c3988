/**
 * What the commands print for every demo part: `extract --json`, `netlist` (SPICE, every
 * sample's default), `netlist --format json` and `advise` for every circuit. The golden copy
 * in test/demo/golden/ is what the restructuring of the code must not change (DEVELOPERS.md:
 * "Behaviour unchanged"). Rewrite it on purpose only, after a change that is meant to change the
 * numbers: `npx tsx test/demo/golden.ts --write`.
 */
import { readdirSync, readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { main } from '../../scripts/motional.ts';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const PARTS_DIR = join(ROOT, 'content', 'parts');
export const GOLDEN_DIR = join(ROOT, 'test', 'demo', 'golden');

async function run(args: string[]): Promise<string> {
  let out = '';
  let err = '';
  const code = await main(args, { out: (t) => void (out += t), err: (t) => void (err += t) });
  const text = `$ motional ${args.join(' ')}\nexit ${code}\n${out}${err ? `--- stderr\n${err}` : ''}`;
  // Paths relative to the checkout, so the copy holds wherever the repository is cloned.
  return text.split(ROOT + '/').join('');
}

/** The commands' output for one demo part, as one text. */
export async function goldenOf(id: string): Promise<string> {
  const dir = join(PARTS_DIR, id);
  const parts = [
    await run(['extract', dir, '--json']),
    await run(['netlist', dir]),
    await run(['netlist', dir, '--format', 'json']),
    await run(['advise', dir]),
  ];
  return parts.join('\n');
}

export function demoIds(): string[] {
  return readdirSync(PARTS_DIR, { withFileTypes: true })
    .filter((d) => d.isDirectory())
    .map((d) => d.name)
    .sort();
}

export function goldenFile(id: string): string {
  return join(GOLDEN_DIR, `${id}.txt`);
}

export function readGolden(id: string): string {
  return readFileSync(goldenFile(id), 'utf8');
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href && process.argv.includes('--write')) {
  mkdirSync(GOLDEN_DIR, { recursive: true });
  for (const id of demoIds()) writeFileSync(goldenFile(id), await goldenOf(id));
  console.log(`wrote ${demoIds().length} golden files to ${GOLDEN_DIR}`);
}
