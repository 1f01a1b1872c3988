/**
 * A synthetic part folder for the `netlist` and `advise` command tests: the reference resonator
 * X1 (L1 10 mH, C1 10 fF, R1 20 Ω, C0 3 pF) plus a second branch (L2 = 40 mH, R2 = 150 Ω,
 * C2 = 2.468878 fF, 100 kHz above fs) as a spurious mode, measured as reflection sweeps written
 * by the project's own model Touchstone writer. Invented part; not a real product.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import { formatModelTouchstone } from '../../src/lib/models/model-touchstone.ts';

export const FS_X1 = 1e8 / (2 * Math.PI);
export const FS_SPUR = FS_X1 + 100e3;

/** X1 + spurious branch, with R1 and C1 scaled per sample to make a lot. */
export function designModel(scale = 1): BvdModel {
  return {
    c0F: 3e-12,
    branches: [
      { fsHz: FS_X1 * (1 + (scale - 1) * 1e-5), r1Ohm: 20 * scale, c1F: 10e-15 },
      { fsHz: FS_SPUR, r1Ohm: 150, c1F: 2.468878e-15 },
    ],
  };
}

function sweep(model: BvdModel, startHz: number, stopHz: number, points: number): string {
  const r = formatModelTouchstone(model, { partId: 'dsn-16m', sample: 'synthetic' }, { startHz, stopHz, points });
  if (!r.ok) throw new Error(r.reason);
  return r.text;
}

/** Write the part into `dir` with one sample per scale; returns the folder. */
export function writeDesignPart(dir: string, scales: number[] = [1]): string {
  const folder = join(dir, 'dsn-16m');
  mkdirSync(folder, { recursive: true });
  const samples = scales.map((scale, i) => {
    const id = `S${i + 1}`;
    const m = designModel(scale);
    const f1 = m.branches[0].fsHz;
    writeFileSync(join(folder, `${id}-main.s1p`), sweep(m, f1 - 2000, f1 + 2000, 801));
    writeFileSync(join(folder, `${id}-spur.s1p`), sweep(m, FS_SPUR - 2000, FS_SPUR + 2000, 801));
    writeFileSync(join(folder, `${id}-wide.s1p`), sweep(m, 14e6, 18e6, 801));
    return `  - id: ${id}
    measured: 2026-03-0${i + 1}
    temperature: 25 C
    sweeps:
${['main', 'spur', 'wide'].map((k) => `      - file: ${id}-${k}.s1p\n        fixture: reflection\n        drive: 10 uW`).join('\n')}`;
  });
  writeFileSync(
    join(folder, 'part.yaml'),
    `id: dsn-16m
title: 16 MHz design check part (synthetic)
kind: quartz-at
datasheet:
  frequency: 15.9208 MHz
  tolerance: 20 ppm
  loadCapacitance: 12 pF
  esrMax: 40 ohm
  driveMax: 100 uW
  overtone: 1
samples:
${samples.join('\n')}
`,
  );
  return folder;
}
