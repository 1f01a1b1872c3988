/**
 * A one-line text form of a BVD model for the command line and tests:
 *
 *   `fs=16MHz r1=20 c1=10f c0=3p`                       one branch
 *   `fs=16MHz r1=20 c1=10f c0=3p; fs=16.1MHz r1=150 l1=40m`   one branch per `;` group
 *
 * Branch keys: `fs` (Hz), `r1` (Ω), and `c1` (F) or `l1` (H) — with `l1`, C1 = 1/((2πfs)²L1).
 * Model keys (any group): `c0`, `cp` (F), `rs` (Ω), `ls` (H). Values take SI prefixes, the
 * unit is optional (`10f` = `10fF`, `20` = `20 ohm`).
 */
import type { BvdModel, MotionalBranch } from '../models/bvd.ts';
import { parseQuantity, type UnitKind } from '../units/si.ts';

export type ModelSpecResult = { ok: true; model: BvdModel } | { ok: false; message: string };

const KEYS: Record<string, { kind: UnitKind; unit: string; scope: 'branch' | 'model' }> = {
  fs: { kind: 'frequency', unit: 'Hz', scope: 'branch' },
  r1: { kind: 'resistance', unit: 'ohm', scope: 'branch' },
  c1: { kind: 'capacitance', unit: 'F', scope: 'branch' },
  l1: { kind: 'inductance', unit: 'H', scope: 'branch' },
  c0: { kind: 'capacitance', unit: 'F', scope: 'model' },
  cp: { kind: 'capacitance', unit: 'F', scope: 'model' },
  rs: { kind: 'resistance', unit: 'ohm', scope: 'model' },
  ls: { kind: 'inductance', unit: 'H', scope: 'model' },
};

/** Parse the text form of a model; messages name the bad token and what was expected. */
export function parseModelSpec(text: string): ModelSpecResult {
  const model: Record<string, number> = {};
  const branches: MotionalBranch[] = [];
  const groups = text
    .split(';')
    .map((g) => g.trim())
    .filter((g) => g !== '');
  if (groups.length === 0)
    return { ok: false, message: 'expected a model such as "fs=16MHz r1=20 c1=10f c0=3p", got an empty text' };
  for (const group of groups) {
    const branch: Record<string, number> = {};
    for (const token of group.split(/[\s,]+/).filter((t) => t !== '')) {
      const m = /^([a-z0-9]+)=(.+)$/i.exec(token);
      if (!m) return { ok: false, message: `expected key=value, got "${token}"` };
      const key = m[1].toLowerCase();
      const def = KEYS[key];
      if (!def) return { ok: false, message: `unknown key "${m[1]}", expected one of ${Object.keys(KEYS).join(', ')}` };
      const value = parseLooseQuantity(m[2], def.kind, def.unit);
      if (typeof value === 'string') return { ok: false, message: `${key}: ${value}` };
      if (!(value > 0) && !(def.scope === 'model' && value === 0))
        return { ok: false, message: `${key}: expected a positive value, got "${m[2]}"` };
      (def.scope === 'branch' ? branch : model)[key] = value;
    }
    if (Object.keys(branch).length === 0) continue;
    if (branch.fs === undefined || branch.r1 === undefined)
      return { ok: false, message: `a branch needs fs and r1, got "${group}"` };
    if ((branch.c1 === undefined) === (branch.l1 === undefined))
      return { ok: false, message: `a branch needs exactly one of c1 or l1, got "${group}"` };
    const w = 2 * Math.PI * branch.fs;
    branches.push({ fsHz: branch.fs, r1Ohm: branch.r1, c1F: branch.c1 ?? 1 / (w * w * branch.l1) });
  }
  if (branches.length === 0) return { ok: false, message: 'expected at least one branch (fs, r1, c1 or l1)' };
  if (model.c0 === undefined) return { ok: false, message: 'expected c0, e.g. "c0=3p"' };
  const out: BvdModel = { c0F: model.c0, branches };
  if (model.rs !== undefined) out.rsOhm = model.rs;
  if (model.ls !== undefined) out.lsH = model.ls;
  if (model.cp !== undefined) out.cpF = model.cp;
  return { ok: true, model: out };
}

/**
 * A quantity whose unit may be left out: "10f" reads as "10fF", "20" as "20ohm".
 * @returns the SI value, or the message of the failed parse
 */
export function parseLooseQuantity(text: string, kind: UnitKind, unit: string): number | string {
  const direct = parseQuantity(text, kind);
  if (direct.ok) return direct.value;
  const withUnit = parseQuantity(`${text}${unit}`, kind);
  return withUnit.ok ? withUnit.value : direct.message;
}
