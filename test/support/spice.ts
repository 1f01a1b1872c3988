/**
 * Run SPICE AC decks on two independent engines and get impedance rows back:
 * eecircuit-engine (ngspice compiled to WebAssembly, npm; runs in every `npm test`) and Debian's
 * `ngspice -b` (a second check; gate it with requireTool('ngspice')).
 *
 * A test bench drives node `in` with a 1 V AC source V1 and measures Z = −v(in)/i(v1), the
 * impedance from `in` to ground of whatever the circuit text connects there.
 *
 *   const deck = impedanceDeck('X1 narrow', netlist + 'XDUT in 0 X1\n', { startHz, stopHz, points }, 'x1-narrow.out');
 *   const a = await engineImpedance(deck);   // eecircuit-engine, started once per process
 *   const b = ngspiceImpedance(deck);        // Debian ngspice in a temp dir
 *   // rows: [freqHz, zRe, zIm][]
 *
 * Decks are plain ngspice decks: `ngspice -b deck.cir` writes the rows with `wrdata` (15 digits,
 * `set numdgt=15`) to the file named in the deck, then `quit`s (without it batch ngspice exits 1,
 * "no simulations run", after the control block). The engine ignores the `.control` block and
 * returns its raw double-precision data.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** One row: frequency (Hz), Re Z (Ω), Im Z (Ω). */
export type ImpedanceRow = [number, number, number];

/** A linear AC sweep. */
export interface AcSweep {
  startHz: number;
  stopHz: number;
  points: number;
}

/** Number with 17 significant digits (exact for a double) for deck lines. */
function exact(x: number): string {
  return x.toExponential(16);
}

/**
 * A complete deck: title, the circuit text (subcircuits and the instance(s) connecting node
 * `in` to ground), the source, `.ac lin`, and a `.control` block for batch ngspice that writes
 * `outFile` (relative to the working directory) with rows `f re(z) im(z)`.
 */
export function impedanceDeck(title: string, circuit: string, sweep: AcSweep, outFile = 'z.out'): string {
  if (!/^[A-Za-z0-9_.-]+$/.test(outFile)) throw new Error(`bad output file name ${outFile}`);
  return [
    `* ${title.replace(/[\r\n]+/g, ' ')}`,
    circuit.trimEnd(),
    '* test bench: 1 V AC into node in; Z = -v(in)/i(v1)',
    'V1 in 0 dc 0 ac 1',
    `.ac lin ${sweep.points} ${exact(sweep.startHz)} ${exact(sweep.stopHz)}`,
    '.control',
    'set numdgt=15',
    'run',
    'let z = -v(in)/i(v1)',
    `wrdata ${outFile} z`,
    'quit',
    '.endc',
    '.end',
    '',
  ].join('\n');
}

/** The deck without its `.control` block (what the engine runs). */
function withoutControl(deck: string): string {
  return deck.replace(/^\.control[\s\S]*?^\.endc\s*$/im, '');
}

interface EngineLike {
  setNetList(text: string): void;
  runSim(): Promise<{ dataType: string; data: Array<{ name: string; values: unknown[] }> }>;
  getError(): string[];
}

let enginePromise: Promise<EngineLike> | undefined;

/** The eecircuit-engine simulator, started once per process (start takes about a second). */
export function startEngine(): Promise<EngineLike> {
  enginePromise ??= (async () => {
    const { Simulation } = await import('eecircuit-engine');
    const sim = new Simulation();
    await sim.start();
    return sim as unknown as EngineLike;
  })();
  return enginePromise;
}

/** Run a deck on eecircuit-engine; rows of Z = −v(in)/i(v1). Throws on simulator errors. */
export async function engineImpedance(deck: string): Promise<ImpedanceRow[]> {
  const sim = await startEngine();
  sim.setNetList(withoutControl(deck));
  const result = await sim.runSim();
  const errors = sim.getError();
  if (errors.length) throw new Error(`eecircuit-engine: ${errors.join('; ')}`);
  if (result.dataType !== 'complex')
    throw new Error(`eecircuit-engine: expected AC (complex) data, got ${result.dataType}`);
  type C = { real: number; img: number };
  const col = (name: string) => {
    const d = result.data.find((x) => x.name.toLowerCase() === name);
    if (!d) throw new Error(`eecircuit-engine: no vector ${name} (have ${result.data.map((x) => x.name).join(', ')})`);
    return d.values as C[];
  };
  const f = col('frequency');
  const v = col('v(in)');
  const i = col('i(v1)');
  return f.map((fk, k) => {
    // Z = −v/i
    const den = i[k].real * i[k].real + i[k].img * i[k].img;
    const re = -(v[k].real * i[k].real + v[k].img * i[k].img) / den;
    const im = -(v[k].img * i[k].real - v[k].real * i[k].img) / den;
    return [fk.real, re, im];
  });
}

/** Parse `wrdata` output: whitespace-separated `f re im` rows. */
export function parseWrdata(text: string): ImpedanceRow[] {
  return text
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l !== '')
    .map((l) => {
      const n = l.split(/\s+/).map(Number);
      if (n.length < 3 || n.some((x) => !Number.isFinite(x))) throw new Error(`wrdata: bad row "${l}"`);
      return [n[0], n[1], n[2]] as ImpedanceRow;
    });
}

/** Run a deck with Debian `ngspice -b` in a temporary directory; rows from its wrdata file. */
export function ngspiceImpedance(deck: string): ImpedanceRow[] {
  const out = /^wrdata\s+(\S+)/m.exec(deck)?.[1];
  if (!out) throw new Error('deck has no wrdata line');
  const dir = mkdtempSync(join(tmpdir(), 'motional-spice-'));
  try {
    writeFileSync(join(dir, 'deck.cir'), deck);
    execFileSync('ngspice', ['-b', 'deck.cir'], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'], timeout: 60_000 });
    return parseWrdata(readFileSync(join(dir, out), 'utf8'));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
