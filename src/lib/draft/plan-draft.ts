/**
 * What a draft record says about a folder of sweeps (README: Commands, `motional new`): each
 * sweep's fixture and role, the compensation files, the added capacitance a loaded sweep implies,
 * the part's kind and nominal frequency. Pure: the files come in already read.
 *
 * Roles, from the main resonance of each sweep (sweep-features.ts):
 * - wide: the span is at least ten times the narrowest sweep's (or, alone, over 0.3 % of fs);
 * - narrow sweeps around one mode (fs within 0.2 %): the one with the lowest fs, and among
 *   equal ones the smallest shunt capacitance, is the plain narrow sweep; another with a shunt
 *   capacitance larger by over 5 % (0.1 pF at least) and the same fs is loaded with a parallel
 *   capacitor Ca = C − C(plain) (its anti-resonance moves down, fa = fs·√(1 + C1/(C0 + Ca)));
 *   another with fs moved up by over two bandwidths is loaded with a series capacitor,
 *   Ca = C1/((fL/fs)² − 1) − C0 (IEEE Std 177's load resonance); else a repeat.
 * - Files named open/short/load that show no resonance are compensation sweeps.
 * - Modes whose frequencies are neither within 2 % nor near an odd multiple (±1 %) of each
 *   other, or plain narrow sweeps whose shunt capacitances differ by over 30 %, are parts mixed
 *   in one folder: no draft.
 */
import { compensateOpenShort } from '../fixture/compensation.ts';
import { networkToImpedance } from '../fixture/to-impedance.ts';
import type { Fixture, PartKind } from '../schema/part.ts';
import type { ImpedanceSweep, NetworkData } from '../sweep/sweep.ts';
import { guessFixture } from './fixture-guess.ts';
import { sweepFeatures, type SweepFeatures } from './sweep-features.ts';

/** One file of the folder, as read. */
export type DraftInputFile =
  | { name: string; network: NetworkData }
  | { name: string; impedance: ImpedanceSweep; csv: { headerLine: number; preambleLines: number; columns: string } }
  | { name: string; error: string };

export type SweepRole = 'narrow' | 'wide' | 'loaded' | 'repeat';

export interface DraftSweep {
  file: string;
  fixture: Fixture;
  fixtureNote: string;
  fixtureUnsure: boolean;
  /** What the file holds, for a comment. */
  formatNote: string;
  referenceImpedanceOhm?: number;
  role: SweepRole;
  roleNote: string;
  addedCapacitanceF?: number;
  addedConnection?: 'parallel' | 'series';
  features: SweepFeatures;
}

export interface DraftPlan {
  kind: PartKind;
  kindNote: string;
  /** Main mode's fs, Hz, and the nominal frequency proposed from it. */
  mainFsHz: number;
  nominalHz: number;
  compensation?: { open: string; short: string; load?: string; fixture: Fixture; note: string };
  sweeps: DraftSweep[];
  /** Files not used, with the reason. */
  skipped: Array<{ file: string; reason: string }>;
}

export type DraftOutcome =
  { ok: true; plan: DraftPlan } | { ok: false; message: string; skipped: Array<{ file: string; reason: string }> };

const COMPENSATION_NAME = /(?:^|[^a-z])(open|short|load)(?:[^a-z]|$)/i;

interface Candidate {
  file: DraftInputFile & { name: string };
  fixture: Fixture;
  fixtureNote: string;
  fixtureUnsure: boolean;
  formatNote: string;
  z0?: number;
  raw?: ImpedanceSweep;
  network?: NetworkData;
}

/** Plan a draft from the files of a folder. */
export function planDraft(files: DraftInputFile[], opts: { kind?: PartKind } = {}): DraftOutcome {
  const skipped: Array<{ file: string; reason: string }> = [];
  const cands: Candidate[] = [];
  for (const f of files) {
    if ('error' in f) {
      skipped.push({ file: f.name, reason: f.error });
      continue;
    }
    if ('network' in f) {
      const g = guessFixture(f.network);
      const net = f.network;
      const z0 = net.parameter === 'S' ? net.z0Ohm[0] : undefined;
      const formatNote = `${net.format
        .replace('touchstone-', 'Touchstone ')
        .replace(/ (\d)$/, ' $1.x')
        .replace(
          '2.x',
          '2.0',
        )}, ${net.ports}-port ${net.parameter}${z0 !== undefined ? `, reference ${fmt(z0, 'ohm', 6)}` : ''}`;
      cands.push({
        file: f,
        fixture: g.fixture,
        fixtureNote: g.reason,
        fixtureUnsure: !!g.unsure,
        formatNote,
        z0,
        network: net,
      });
    } else {
      const pre = f.csv.preambleLines
        ? `, header on line ${f.csv.headerLine} after ${f.csv.preambleLines} preamble line${f.csv.preambleLines === 1 ? '' : 's'}`
        : '';
      cands.push({
        file: f,
        fixture: 'impedance',
        fixtureNote: 'a CSV export holds the impedance itself',
        fixtureUnsure: false,
        formatNote: `CSV impedance (${f.csv.columns})${pre}`,
        raw: f.impedance,
      });
    }
  }
  // Impedance per candidate (raw: no compensation yet).
  const withZ: Array<Candidate & { raw: ImpedanceSweep; features: SweepFeatures }> = [];
  for (const c of cands) {
    let raw = c.raw;
    if (!raw && c.network) {
      try {
        raw = networkToImpedance(c.network, c.fixture, c.file.name);
      } catch (e) {
        skipped.push({
          file: c.file.name,
          reason: `cannot convert as ${c.fixture}: ${e instanceof Error ? e.message : String(e)}`,
        });
        continue;
      }
    }
    withZ.push({ ...c, raw: raw!, features: sweepFeatures(raw!) });
  }
  // Compensation sweeps: named so and without a resonance (they take the fixture of the sweeps they correct).
  const comp: Partial<Record<'open' | 'short' | 'load', (typeof withZ)[number]>> = {};
  const measured: typeof withZ = [];
  for (const c of withZ) {
    const m = COMPENSATION_NAME.exec(c.file.name.replace(/\.[^.]*$/, ''));
    if (m && !comp[m[1].toLowerCase() as 'open'] && (!c.features.resonant || c.network?.parameter === 'S')) {
      comp[m[1].toLowerCase() as 'open'] = c;
      continue;
    }
    if (!c.features.resonant) {
      skipped.push({
        file: c.file.name,
        reason: 'no resonance in the sweep (the reactance never changes sign) and its name says neither open nor short',
      });
      continue;
    }
    measured.push(c);
  }
  if (measured.length === 0) {
    return { ok: false, message: 'no sweep of a part in the folder: nothing shows a resonance', skipped };
  }
  let compensation: DraftPlan['compensation'];
  if (comp.open && comp.short) {
    const ref = measured.find((m) => sameKind(m, comp.open!)) ?? measured[0];
    const fixture = ref.fixture;
    const zOf = (c: (typeof withZ)[number]) =>
      c.network ? networkToImpedance(c.network, fixture, c.file.name) : c.raw;
    try {
      const open = zOf(comp.open);
      const short = zOf(comp.short);
      if (sweepFeatures(open).resonant || sweepFeatures(short).resonant) throw new Error('a resonance');
      compensation = {
        open: comp.open.file.name,
        short: comp.short.file.name,
        load: comp.load?.file.name,
        fixture,
        note: `named open and short, flat (no resonance) as ${fixture} records`,
      };
      for (const m of measured) {
        if (m.fixture !== fixture) continue;
        try {
          m.raw = compensateOpenShort(m.raw, open, short);
          m.features = sweepFeatures(m.raw);
        } catch {
          // frequency ranges that do not overlap: the features stay those of the raw sweep
        }
      }
    } catch {
      for (const k of ['open', 'short'] as const)
        skipped.push({
          file: comp[k]!.file.name,
          reason: `named ${k} but shows a resonance as a ${fixture} record; not used as compensation`,
        });
    }
  } else {
    for (const k of ['open', 'short', 'load'] as const) {
      if (comp[k])
        skipped.push({
          file: comp[k]!.file.name,
          reason: `a ${k} sweep without its ${k === 'open' ? 'short' : 'open'} partner; not used`,
        });
    }
  }
  // Roles.
  const spans = measured.map((m) => m.features.stopHz - m.features.startHz);
  const minSpan = Math.min(...spans);
  const isWide = (i: number) =>
    measured.length > 1 ? spans[i] >= 10 * minSpan : spans[i] > 0.003 * (measured[i].features.fsHz ?? 1);
  const out: DraftSweep[] = [];
  const narrow = measured.map((m, i) => ({ m, i })).filter(({ i }) => !isWide(i));
  const groups: Array<typeof narrow> = [];
  for (const item of narrow) {
    const fs = item.m.features.fsHz!;
    const g = groups.find((gr) => Math.abs(gr[0].m.features.fsHz! / fs - 1) < 2e-3);
    if (g) g.push(item);
    else groups.push([item]);
  }
  const bases: Array<(typeof narrow)[number]> = [];
  const roleOf = new Map<number, Pick<DraftSweep, 'role' | 'roleNote' | 'addedCapacitanceF' | 'addedConnection'>>();
  for (const g of groups) {
    const lowest = Math.min(...g.map((x) => x.m.features.fsHz!));
    const bwOf = (x: (typeof g)[number]) =>
      x.m.features.q ? x.m.features.fsHz! / x.m.features.q : 1e-5 * x.m.features.fsHz!;
    const near = g.filter((x) => x.m.features.fsHz! - lowest < 2 * bwOf(x));
    const base = near.reduce((a, b) => ((b.m.features.shuntF ?? Infinity) < (a.m.features.shuntF ?? Infinity) ? b : a));
    bases.push(base);
    const bf = base.m.features;
    roleOf.set(base.i, {
      role: 'narrow',
      roleNote: `narrow around the mode at ${fmt(bf.fsHz!, 'Hz', 9)} (span ${fmt(bf.stopHz - bf.startHz, 'Hz', 3)})`,
    });
    for (const x of g) {
      if (x === base) continue;
      const f = x.m.features;
      const c0 = bf.shuntF;
      if (f.fsHz! - bf.fsHz! > 2 * bwOf(base) && bf.c1F !== undefined && c0 !== undefined) {
        const ca = bf.c1F / ((f.fsHz! / bf.fsHz!) ** 2 - 1) - c0;
        roleOf.set(x.i, {
          role: 'loaded',
          roleNote: `loaded: the resonance of ${base.m.file.name} moved up from ${fmt(bf.fsHz!, 'Hz', 9)} to ${fmt(f.fsHz!, 'Hz', 9)}, as a capacitor in series does`,
          ...(ca > 0 ? { addedCapacitanceF: ca, addedConnection: 'series' as const } : {}),
        });
      } else if (f.shuntF !== undefined && c0 !== undefined && f.shuntF - c0 > Math.max(0.05 * c0, 0.1e-12)) {
        roleOf.set(x.i, {
          role: 'loaded',
          roleNote: `loaded: the span of ${base.m.file.name}, fs unchanged, shunt capacitance ${fmt(c0, 'F', 3)} → ${fmt(f.shuntF, 'F', 3)} (the anti-resonance moved down), as a capacitor in parallel does`,
          addedCapacitanceF: f.shuntF - c0,
          addedConnection: 'parallel',
        });
      } else {
        roleOf.set(x.i, {
          role: 'repeat',
          roleNote: `the same mode and span as ${base.m.file.name}: a repeat, or another drive level or temperature (say which with drive: or temperature:)`,
        });
      }
    }
  }
  // Mixed parts: mode frequencies that are not one part's fundamental, overtones and nearby modes.
  for (let a = 0; a < bases.length; a++) {
    for (let b = a + 1; b < bases.length; b++) {
      const fa = bases[a].m.features.fsHz!;
      const fb = bases[b].m.features.fsHz!;
      const ratio = Math.max(fa, fb) / Math.min(fa, fb);
      const related = ratio < 1.02 || [3, 5, 7, 9, 11].some((k) => Math.abs(ratio / k - 1) < 0.01);
      const ca = bases[a].m.features.shuntF;
      const cb = bases[b].m.features.shuntF;
      const sameC0 = ca === undefined || cb === undefined || Math.abs(ca - cb) <= 0.3 * Math.max(ca, cb);
      if (!related || !sameC0) {
        const why = !related
          ? `modes at ${fmt(fa, 'Hz', 6)} and ${fmt(fb, 'Hz', 6)} are not one part's (neither close nor an odd overtone)`
          : `shunt capacitances ${fmt(ca!, 'F', 3)} and ${fmt(cb!, 'F', 3)} differ by over 30 %`;
        return {
          ok: false,
          message: `the sweeps look like more than one part: ${bases[a].m.file.name} and ${bases[b].m.file.name}: ${why}; put each part's sweeps in its own folder`,
          skipped,
        };
      }
    }
  }
  measured.forEach((m, i) => {
    if (isWide(i)) {
      const f = m.features;
      roleOf.set(i, {
        role: 'wide',
        roleNote: `wide: ${fmt(f.startHz, 'Hz', 4)} to ${fmt(f.stopHz, 'Hz', 4)} across C0 and the modes${f.faHz ? ` (main anti-resonance near ${fmt(f.faHz, 'Hz', 6)})` : ''}`,
      });
    }
  });
  const order: SweepRole[] = ['narrow', 'loaded', 'repeat', 'wide'];
  measured.forEach((m, i) => {
    const r = roleOf.get(i)!;
    out.push({
      file: m.file.name,
      fixture: m.fixture,
      fixtureNote: m.fixtureNote,
      fixtureUnsure: m.fixtureUnsure,
      formatNote: m.formatNote,
      referenceImpedanceOhm: m.z0,
      ...r,
      features: m.features,
    });
  });
  out.sort((a, b) => order.indexOf(a.role) - order.indexOf(b.role));
  // Main mode: the strongest plain narrow sweep's (smallest R1), else the wide sweep's.
  const main = bases.length
    ? bases.reduce((a, b) => ((b.m.features.r1Ohm ?? Infinity) < (a.m.features.r1Ohm ?? Infinity) ? b : a)).m.features
    : measured[0].features;
  const mainFsHz = main.fsHz!;
  const inferred = inferKind(main);
  const kind = opts.kind ?? inferred.kind;
  const kindNote = opts.kind ? 'given with --kind' : inferred.note;
  return {
    ok: true,
    plan: { kind, kindNote, mainFsHz, nominalHz: Number(mainFsHz.toPrecision(5)), compensation, sweeps: out, skipped },
  };
}

function sameKind(a: Candidate, b: Candidate): boolean {
  if (!a.network || !b.network) return !a.network && !b.network;
  return a.network.ports === b.network.ports && a.network.parameter === b.network.parameter;
}

/** The kind from fs and Q (common practice: tuning forks run below 1 MHz at Q over 10,000; ceramics have Q of hundreds to a few thousand). */
function inferKind(f: SweepFeatures): { kind: PartKind; note: string } {
  const fs = f.fsHz!;
  const q = f.q;
  const qText = q !== undefined ? `, Q about ${Number(q.toPrecision(2))}` : '';
  if (q !== undefined && q < 5000)
    return { kind: 'ceramic', note: `inferred from Q${qText.slice(1)} (ceramic resonators stay below a few thousand)` };
  if (fs < 1e6)
    return {
      kind: 'quartz-tuning-fork',
      note: `inferred from fs ${fmt(fs, 'Hz', 5)}${qText} (a tuning fork below 1 MHz)`,
    };
  return { kind: 'quartz-at', note: `inferred from fs ${fmt(fs, 'Hz', 5)}${qText} (an AT-cut crystal above 1 MHz)` };
}

const PREFIXES: Array<[number, string]> = [
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'u'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
  [1e-18, 'a'],
];

/** A quantity with an SI prefix and `digits` significant digits, trailing zeros dropped: `16.000318 MHz`, `10.2 pF`. */
export function fmt(value: number, unit: string, digits: number): string {
  if (value === 0 || !Number.isFinite(value)) return `${value}${unit ? ` ${unit}` : ''}`;
  const a = Math.abs(value);
  const [scale, prefix] = PREFIXES.find(([s]) => a >= s * 0.9999999) ?? PREFIXES[PREFIXES.length - 1];
  const text = String(Number((value / scale).toPrecision(digits)));
  return unit || prefix ? `${text} ${prefix}${unit}` : text;
}
