/**
 * Folders of sweep files of known parts, as a bench leaves them before anyone writes a record:
 * every fixture, Touchstone 1.x and 2.0 and impedance CSV, with and without open/short
 * compensation and loaded sweeps. Written with the project's synthesis (src/lib/synth), labelled
 * synthetic; the true model, fixture and added capacitances come back with the folder.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import type { Fixture } from '../../src/lib/schema/part.ts';
import { formatSynthFile, type SynthFileFormat } from '../../src/lib/synth/synth-file.ts';
import { synthesizeCompensation } from '../../src/lib/synth/synth-compensation.ts';
import { synthesizeSweep, type AddedCapacitor, type FixtureParasitics } from '../../src/lib/synth/synth-sweep.ts';
import type { FreqGridSpec } from '../../src/lib/synth/freq-grid.ts';

/** A 16 MHz AT-cut crystal and a 32.768 kHz tuning fork (invented values of the usual size). */
export const AT_16M: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 16e6, r1Ohm: 20, c1F: 10e-15 }] };
export const FORK_32K: BvdModel = { c0F: 1.3e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
export const AT_12M: BvdModel = { c0F: 4.5e-12, branches: [{ fsHz: 12e6, r1Ohm: 30, c1F: 15e-15 }] };

export interface FolderSpec {
  model: BvdModel;
  fixture: Fixture;
  /** 1 for a reflection or Z record on one port, 2 for two-port files. */
  ports?: 1 | 2;
  parameter?: 'Z' | 'Y';
  format: SynthFileFormat;
  compensation?: boolean;
  /** Loaded sweeps: capacitance and connection. */
  loads?: AddedCapacitor[];
  wide?: boolean;
  seed?: number;
}

export interface WrittenFolder {
  folder: string;
  /** File name → role and the true added capacitor. */
  files: Record<string, { role: 'narrow' | 'wide' | 'loaded'; added?: AddedCapacitor }>;
  compensation?: { open: string; short: string };
}

const ext = (f: SynthFileFormat, ports: number) =>
  f.kind === 'csv'
    ? f.delimiter === '\t'
      ? 'tsv'
      : 'csv'
    : f.version === 2
      ? ports === 1
        ? 's1p'
        : 's2p'
      : `s${ports}p`;

/** Write a folder of one part's sweeps. */
export function writeFolder(folder: string, spec: FolderSpec): WrittenFolder {
  mkdirSync(folder, { recursive: true });
  const b = spec.model.branches[0];
  const q = 1 / (2 * Math.PI * b.fsHz * b.c1F * b.r1Ohm);
  const bw = b.fsHz / q;
  const parasitics: FixtureParasitics | undefined = spec.compensation
    ? { rsOhm: 0.3, lsH: 2e-9, cpF: 0.6e-12 }
    : undefined;
  const ports: 1 | 2 =
    spec.fixture === 'series-thru' || spec.fixture === 'shunt-thru'
      ? 2
      : spec.fixture === 'impedance'
        ? 1
        : (spec.ports ?? 1);
  const x = ext(spec.format, ports);
  const z0Ohm = spec.fixture === 'impedance' ? (b.r1Ohm > 1e3 ? 1e4 : 100) : 50;
  const common = {
    fixture: spec.fixture,
    ports,
    parameter: spec.parameter,
    z0Ohm,
    parasitics,
    floorDb: -90,
    traceNoise: 2e-5,
    freqResolutionHz: b.fsHz > 1e6 ? 0.001 : 1e-6,
  };
  const out: WrittenFolder = { folder, files: {} };
  let seed = spec.seed ?? 11;
  const write = (name: string, grid: FreqGridSpec, added?: AddedCapacitor) => {
    const rec = synthesizeSweep({ ...common, model: spec.model, grid, added, seed: seed++, source: name });
    writeFileSync(join(folder, name), formatSynthFile(rec, spec.format));
  };
  write(`a1-narrow.${x}`, { kind: 'centered', centerHz: b.fsHz, spanHz: 14 * bw, points: 401 });
  out.files[`a1-narrow.${x}`] = { role: 'narrow' };
  for (const load of spec.loads ?? []) {
    const c0 = spec.model.c0F;
    const centre = load.connection === 'series' ? b.fsHz * Math.sqrt(1 + b.c1F / (c0 + load.capacitanceF)) : b.fsHz;
    const name = `a1-narrow-${load.connection === 'series' ? 's' : 'p'}${Math.round(load.capacitanceF * 1e12)}pf.${x}`;
    write(name, { kind: 'centered', centerHz: centre, spanHz: 14 * bw, points: 401 }, load);
    out.files[name] = { role: 'loaded', added: load };
  }
  if (spec.wide !== false) {
    const fa = b.fsHz * Math.sqrt(1 + b.c1F / spec.model.c0F);
    const span = 4 * (fa - b.fsHz);
    write(`a1-wide.${x}`, {
      kind: 'segments',
      segments: [
        { kind: 'linear', startHz: b.fsHz - span, stopHz: b.fsHz + 2 * span, points: 1601 },
        { kind: 'centered', centerHz: b.fsHz, spanHz: 14 * bw, points: 201 },
        { kind: 'centered', centerHz: fa, spanHz: 14 * bw, points: 201 },
      ],
    });
    out.files[`a1-wide.${x}`] = { role: 'wide' };
  }
  if (spec.compensation) {
    const fa = b.fsHz * Math.sqrt(1 + b.c1F / spec.model.c0F);
    const span = 4 * (fa - b.fsHz);
    const comp = synthesizeCompensation({
      ...common,
      parasitics: parasitics!,
      grid: { kind: 'linear', startHz: b.fsHz - 2 * span, stopHz: b.fsHz + 3 * span, points: 801 },
      seed: 900,
      source: 'c',
    });
    writeFileSync(join(folder, `open.${x}`), formatSynthFile({ ...comp.open, seed: 900 }, spec.format));
    writeFileSync(join(folder, `short.${x}`), formatSynthFile({ ...comp.short, seed: 901 }, spec.format));
    out.compensation = { open: `open.${x}`, short: `short.${x}` };
  }
  return out;
}
