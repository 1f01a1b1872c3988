/**
 * Reader of `content/oscillators.yaml`: text in, circuits and located issues out.
 * Each circuit is validated on its own, so one bad circuit does not hide the others; a circuit
 * with any error is left out of `circuits`. Positions come from the yaml package's LineCounter:
 * every issue names the file, line, column and field path (e.g. `circuits[1].gm`).
 */
import { isMap, isNode, isSeq, LineCounter, parseDocument, type Document, type Node } from 'yaml';
import { type Issue } from '../issues.ts';
import { CIRCUIT_KEYS, OscillatorCircuitSchema, type OscillatorCircuit } from '../schema/oscillators.ts';

/** Largest oscillators file accepted, characters. */
export const MAX_OSCILLATORS_CHARS = 1024 * 1024;

export interface ParseOscillatorsResult {
  circuits: OscillatorCircuit[];
  issues: Issue[];
}

type PathKey = string | number;

function pathText(path: PathKey[]): string {
  return path.map((k, i) => (typeof k === 'number' ? `[${k}]` : i === 0 ? k : `.${k}`)).join('');
}

/** Position of the deepest existing node on `path` (the value when present, else its parent). */
function locate(doc: Document, lc: LineCounter, path: PathKey[]): { line: number; col: number } {
  for (let n = path.length; n >= 0; n--) {
    const node = n === 0 ? doc.contents : doc.getIn(path.slice(0, n), true);
    if (isNode(node) && node.range) return lc.linePos(node.range[0]);
  }
  return { line: 1, col: 1 };
}

/** Parse and validate the oscillators file. */
export function parseOscillatorsYaml(text: string, file: string): ParseOscillatorsResult {
  const issues: Issue[] = [];
  const err = (
    line: number,
    col: number,
    path: PathKey[],
    message: string,
    severity: Issue['severity'] = 'error',
  ): void => {
    issues.push({
      severity,
      file,
      line,
      col,
      path: path.length ? pathText(path) : undefined,
      message,
      code: 'oscillators',
    });
  };
  if (text.length > MAX_OSCILLATORS_CHARS) {
    err(1, 1, [], `file of ${text.length} characters is larger than the ${MAX_OSCILLATORS_CHARS} accepted`);
    return { circuits: [], issues };
  }
  const lc = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lc, uniqueKeys: true, prettyErrors: false });
  for (const e of doc.errors) {
    const pos = e.linePos?.[0] ?? lc.linePos(e.pos[0]);
    err(pos.line, pos.col, [], `yaml: ${e.message.split('\n')[0].toLowerCase()}`);
  }
  if (doc.errors.length) return { circuits: [], issues };

  const root = doc.contents;
  const list = isMap(root) ? root.get('circuits', true) : undefined;
  if (!isMap(root) || !isSeq(list)) {
    const pos = locate(doc, lc, []);
    err(pos.line, pos.col, ['circuits'], 'expected a top-level "circuits:" list');
    return { circuits: [], issues };
  }
  for (const pair of root.items) {
    const key = isNode(pair.key) ? String((pair.key as Node & { value?: unknown }).value ?? '') : String(pair.key);
    if (key !== 'circuits') {
      const pos = isNode(pair.key) && pair.key.range ? lc.linePos(pair.key.range[0]) : { line: 1, col: 1 };
      err(pos.line, pos.col, [key], `unknown key "${key}" ignored (expected only "circuits")`, 'warning');
    }
  }
  if (list.items.length === 0) {
    const pos = locate(doc, lc, ['circuits']);
    err(pos.line, pos.col, ['circuits'], 'expected at least one circuit');
  }

  const circuits: OscillatorCircuit[] = [];
  const seen = new Map<string, number>();
  list.items.forEach((item, i) => {
    const base: PathKey[] = ['circuits', i];
    if (!isMap(item)) {
      const pos = locate(doc, lc, base);
      err(pos.line, pos.col, base, 'expected a circuit (a map of name, gm, inputCapacitance, ...)');
      return;
    }
    for (const pair of item.items) {
      const key = isNode(pair.key) ? String((pair.key as Node & { value?: unknown }).value ?? '') : String(pair.key);
      if (!CIRCUIT_KEYS.includes(key)) {
        const pos = isNode(pair.key) && pair.key.range ? lc.linePos(pair.key.range[0]) : locate(doc, lc, base);
        err(
          pos.line,
          pos.col,
          [...base, key],
          `unknown key "${key}" ignored (known: ${CIRCUIT_KEYS.join(', ')})`,
          'warning',
        );
      }
    }
    const parsed = OscillatorCircuitSchema.safeParse(item.toJS(doc));
    if (!parsed.success) {
      for (const zi of parsed.error.issues) {
        const path = [...base, ...(zi.path as PathKey[])];
        const pos = locate(doc, lc, path);
        const missing = zi.path.length === 1 && doc.getIn(path, true) === undefined;
        err(
          pos.line,
          pos.col,
          path,
          missing ? `missing required field "${String(zi.path[zi.path.length - 1])}"` : zi.message,
        );
      }
      return;
    }
    const circuit = parsed.data;
    const first = seen.get(circuit.name);
    if (first !== undefined) {
      const pos = locate(doc, lc, [...base, 'name']);
      err(pos.line, pos.col, [...base, 'name'], `duplicate circuit name "${circuit.name}" (also circuits[${first}])`);
      return;
    }
    seen.set(circuit.name, i);
    circuits.push(circuit);
  });
  return { circuits, issues };
}
