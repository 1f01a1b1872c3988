/**
 * The layer checker behind test/boundaries.test.ts (DEVELOPERS.md: Layers). A file may import
 * only from its own layer or a lower one; two layers of the same rank may not import each other;
 * and no chain of imports between files may come back to where it started.
 *
 * Imports are read from the text (static `import … from`, `export … from`, side-effect
 * `import '…'` and dynamic `import('…')`, type-only imports included: a type is a dependency
 * too); only relative specifiers name project files.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, posix, relative, sep } from 'node:path';

/** One layer: a name, its rank (lower ranks are imported by higher ones) and the paths it owns. */
export interface Layer {
  name: string;
  rank: number;
  /** Path prefixes relative to the tree's root, posix form (`src/lib/units/`, `src/lib/issues.ts`). */
  paths: string[];
}

/**
 * The project's layers, lowest first. Inside src/lib: units → issues → schema → sweep → io →
 * fixture → models → extract | synth → osc → report | draft (extract and synth share a rank, as
 * do report and draft: neither imports the other). Then lib → pipeline → site | scripts.
 */
export const LIB_LAYERS: Layer[] = [
  { name: 'units', rank: 0, paths: ['src/lib/units/'] },
  { name: 'issues', rank: 1, paths: ['src/lib/issues.ts'] },
  { name: 'schema', rank: 2, paths: ['src/lib/schema/'] },
  { name: 'sweep', rank: 3, paths: ['src/lib/sweep/'] },
  { name: 'io', rank: 4, paths: ['src/lib/io/'] },
  { name: 'fixture', rank: 5, paths: ['src/lib/fixture/'] },
  { name: 'models', rank: 6, paths: ['src/lib/models/'] },
  { name: 'extract', rank: 7, paths: ['src/lib/extract/'] },
  { name: 'synth', rank: 7, paths: ['src/lib/synth/'] },
  { name: 'osc', rank: 8, paths: ['src/lib/osc/'] },
  { name: 'report', rank: 9, paths: ['src/lib/report/'] },
  { name: 'draft', rank: 9, paths: ['src/lib/draft/'] },
];

export const TOP_LAYERS: Layer[] = [
  { name: 'lib', rank: 0, paths: ['src/lib/'] },
  { name: 'pipeline', rank: 1, paths: ['src/pipeline/'] },
  { name: 'site', rank: 2, paths: ['src/site/', 'src/pages/', 'src/components/', 'src/scripts/'] },
  { name: 'scripts', rank: 2, paths: ['scripts/'] },
];

const SOURCE = /\.(ts|mts|mjs|js|astro)$/;
const IMPORT =
  /(?:\bimport\s+(?:type\s+)?(?:[\w*{}\s,$]+?\s+from\s+)?|\bexport\s+(?:type\s+)?(?:\*(?:\s+as\s+\w+)?|\{[^}]*\})\s+from\s+|\bimport\s*\(\s*)['"]([^'"]+)['"]/g;

/** Source files under `dirs` of `root`, as posix paths relative to `root`. */
export function sourceFiles(root: string, dirs: string[]): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir).sort()) {
      const p = join(dir, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (SOURCE.test(name) && !name.endsWith('.d.ts')) out.push(relative(root, p).split(sep).join('/'));
    }
  };
  for (const d of dirs) {
    try {
      if (statSync(join(root, d)).isDirectory()) walk(join(root, d));
    } catch {
      // a tree without this folder
    }
  }
  return out;
}

/** Relative import specifiers of one source text. */
export function importSpecifiers(text: string): string[] {
  return [...text.matchAll(IMPORT)].map((m) => m[1]).filter((s) => s.startsWith('./') || s.startsWith('../'));
}

/** Import graph: file → the project files it imports (posix paths relative to the root). */
export function importGraph(root: string, files: string[]): Map<string, string[]> {
  const graph = new Map<string, string[]>();
  for (const f of files) {
    const text = readFileSync(join(root, f), 'utf8');
    graph.set(
      f,
      importSpecifiers(text).map((s) => posix.normalize(posix.join(posix.dirname(f), s))),
    );
  }
  return graph;
}

function layerOf(file: string, layers: Layer[]): Layer | undefined {
  let best: Layer | undefined;
  let bestLen = -1;
  for (const l of layers) {
    for (const p of l.paths) {
      if ((file === p || file.startsWith(p)) && p.length > bestLen) {
        best = l;
        bestLen = p.length;
      }
    }
  }
  return best;
}

/**
 * Imports that point the wrong way: to a higher rank, or to another layer of the same rank.
 * Each as `FROM (layer) imports TO (layer): why`.
 */
export function layerViolations(graph: Map<string, string[]>, layers: Layer[]): string[] {
  const out: string[] = [];
  for (const [from, targets] of graph) {
    const a = layerOf(from, layers);
    if (!a) continue;
    for (const to of targets) {
      const b = layerOf(to, layers);
      if (!b || b === a) continue;
      if (b.rank > a.rank) out.push(`${from} (${a.name}) imports ${to} (${b.name}): ${b.name} is above ${a.name}`);
      else if (b.rank === a.rank)
        out.push(
          `${from} (${a.name}) imports ${to} (${b.name}): ${a.name} and ${b.name} are side by side and may not import each other`,
        );
    }
  }
  return out;
}

/** Every import cycle between files, each as `a → b → … → a` (one per cycle, from its smallest file). */
export function importCycles(graph: Map<string, string[]>): string[] {
  // Tarjan's strongly connected components; a component of two or more files (or a file that
  // imports itself) holds a cycle, reported along one closed path through it.
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const components: string[][] = [];
  const visit = (v: string) => {
    index.set(v, counter);
    low.set(v, counter++);
    stack.push(v);
    onStack.add(v);
    for (const w of graph.get(v) ?? []) {
      if (!graph.has(w)) continue;
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, index.get(w)!));
    }
    if (low.get(v) === index.get(v)) {
      const comp: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        comp.push(w);
      } while (w !== v);
      components.push(comp);
    }
  };
  for (const v of [...graph.keys()].sort()) if (!index.has(v)) visit(v);
  const out: string[] = [];
  for (const comp of components) {
    const members = new Set(comp);
    const start = [...comp].sort()[0];
    if (comp.length === 1 && !(graph.get(start) ?? []).includes(start)) continue;
    // Breadth-first from start back to start inside the component: the shortest loop.
    const prev = new Map<string, string>();
    const queue = [start];
    let closing: string | undefined;
    while (queue.length && closing === undefined) {
      const v = queue.shift()!;
      for (const w of graph.get(v) ?? []) {
        if (!members.has(w)) continue;
        if (w === start) {
          closing = v;
          break;
        }
        if (!prev.has(w)) {
          prev.set(w, v);
          queue.push(w);
        }
      }
    }
    const path = [start];
    for (let v = closing!; v !== start; v = prev.get(v)!) path.splice(1, 0, v);
    out.push([...path, start].join(' → '));
  }
  return out.sort();
}

/** Everything wrong with the tree under `root`: upward imports (lib and top level) and cycles. */
export function checkLayers(root: string): { files: number; violations: string[]; cycles: string[] } {
  const files = sourceFiles(root, ['src', 'scripts']);
  const graph = importGraph(root, files);
  return {
    files: files.length,
    violations: [...layerViolations(graph, LIB_LAYERS), ...layerViolations(graph, TOP_LAYERS)],
    cycles: importCycles(graph),
  };
}

/** The folder of this module's tree root (two levels up from test/support). */
export const PROJECT_ROOT = join(dirname(new URL(import.meta.url).pathname), '..', '..');
