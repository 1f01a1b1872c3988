/**
 * The Pierce network's negative resistance, effective load capacitance and start-up time constant
 * against SPICE (ngspice: eecircuit-engine in every run, Debian ngspice where installed).
 *
 * AC: a floating 1 A AC current source across the crystal pins of the network (VCCS gm, Ca, Cb,
 * pin-to-pin stray; and with C0 added, what the motional branch sees); Z = v(p1) − v(p2).
 * 10 TΩ resistors to ground give the DC operating point; at the frequencies here they shift Z by
 * under 1e-6.
 *
 * Transient: a behavioural Pierce circuit (B source i = Imax·tanh(gm·v1/Imax), the limiting
 * transconductance) with the full crystal (R1, L1, C1, C0), started from a small motional current;
 * the envelope of the motional current is fitted on ln(peak) against time while the amplitude
 * stays far below limiting.
 */
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  impedanceAtPins,
  impedanceSeenByMotionalBranch,
  loopFrequencyHz,
  negativeResistance,
  type PierceNetwork,
} from '../../../src/lib/osc/pierce-network.ts';
import { startupTauS } from '../../../src/lib/osc/startup.ts';
import { startEngine } from '../../support/spice.ts';
import { requireTool } from '../../support/tools.ts';

const e = (x: number) => x.toExponential(16);

interface NetCase {
  name: string;
  freqHz: number;
  gmS: number;
  /** Fixed pin capacitance (amplifier pin + board) added to each external capacitor, F. */
  pinF: number;
  pinToPinF: number;
  c0F: number;
}

/** Two circuits of content/oscillators.yaml-like size: a 16 MHz MCU clock and a 32.768 kHz RTC. */
const NETS: NetCase[] = [
  { name: 'mcu-16MHz', freqHz: 16e6, gmS: 8e-3, pinF: 4.5e-12, pinToPinF: 0.3e-12, c0F: 3e-12 },
  { name: 'rtc-32k', freqHz: 32768, gmS: 25e-6, pinF: 6e-12, pinToPinF: 0.5e-12, c0F: 1.3e-12 },
];
/** External capacitor sweep, F (equal on both pins, and one unequal pair ×1.5). */
const CAPS = [2e-12, 4.7e-12, 8.2e-12, 12e-12, 18e-12, 27e-12, 39e-12];

function acDeck(c: NetCase, withC0: boolean): { deck: string; nets: PierceNetwork[] } {
  const lines = [`* pierce network ${c.name}${withC0 ? ' with C0' : ''}`];
  const nets: PierceNetwork[] = [];
  CAPS.forEach((x, k) => {
    const net = { gmS: c.gmS, caF: x + c.pinF, cbF: 1.5 * x + c.pinF, pinToPinF: c.pinToPinF };
    nets.push(net);
    lines.push(
      `G${k} b${k} 0 a${k} 0 ${e(net.gmS)}`,
      `CA${k} a${k} 0 ${e(net.caF)}`,
      `CB${k} b${k} 0 ${e(net.cbF)}`,
      `CP${k} a${k} b${k} ${e(net.pinToPinF)}`,
      `RA${k} a${k} 0 1e13`,
      `RB${k} b${k} 0 1e13`,
      `I${k} b${k} a${k} dc 0 ac 1`,
    );
    if (withC0) lines.push(`C0${k} a${k} b${k} ${e(c.c0F)}`);
  });
  lines.push(`.ac lin 1 ${e(c.freqHz)} ${e(c.freqHz)}`, '.control', 'set numdgt=15', 'run');
  lines.push(`wrdata z.out ${CAPS.map((_, k) => `v(a${k})-v(b${k})`).join(' ')}`, 'quit', '.endc', '.end', '');
  return { deck: lines.join('\n'), nets };
}

type Complex = { re: number; im: number };

async function engineAc(deck: string, count: number): Promise<Complex[]> {
  const sim = await startEngine();
  sim.setNetList(deck.replace(/^\.control[\s\S]*?^\.endc\s*$/im, ''));
  const result = await sim.runSim();
  const errors = sim.getError();
  if (errors.length) throw new Error(`eecircuit-engine: ${errors.join('; ')}`);
  const col = (name: string) => {
    const d = result.data.find((x) => x.name.toLowerCase() === name);
    if (!d) throw new Error(`no vector ${name}`);
    return (d.values as Array<{ real: number; img: number }>)[0];
  };
  return Array.from({ length: count }, (_, k) => {
    const a = col(`v(a${k})`);
    const b = col(`v(b${k})`);
    return { re: a.real - b.real, im: a.img - b.img };
  });
}

function ngspiceRun(deck: string, outFile: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'motional-pierce-'));
  try {
    writeFileSync(join(dir, 'deck.cir'), deck);
    execFileSync('ngspice', ['-b', 'deck.cir'], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'], timeout: 120_000 });
    return readFileSync(join(dir, outFile), 'utf8');
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function ngspiceAc(deck: string, count: number): Complex[] {
  // wrdata of complex vectors: per vector "f re im" triplets on one row.
  const row = ngspiceRun(deck, 'z.out').trim().split(/\s+/).map(Number);
  return Array.from({ length: count }, (_, k) => ({ re: row[3 * k + 1], im: row[3 * k + 2] }));
}

function acSuite(engine: string, run: (deck: string, count: number) => Promise<Complex[]> | Complex[]) {
  for (const c of NETS) {
    it(`${engine}: ${c.name} — resistance and effective load capacitance at the pins within 1 % over ${CAPS.length} capacitor values`, async () => {
      const { deck, nets } = acDeck(c, false);
      const z = await run(deck, nets.length);
      nets.forEach((net, k) => {
        const ours = negativeResistance(net, c.c0F, c.freqHz);
        const w = 2 * Math.PI * c.freqHz;
        const spiceCl = -1 / (w * z[k].im);
        expect(Math.abs(ours.atPinsOhm / z[k].re - 1)).toBeLessThan(0.01);
        expect(Math.abs(ours.loadCapacitanceF / spiceCl - 1)).toBeLessThan(0.01);
        // tighter in fact: the same linear network
        expect(Math.abs(impedanceAtPins(net, c.freqHz).reOhm / z[k].re - 1)).toBeLessThan(1e-6);
      });
    });
    it(`${engine}: ${c.name} — resistance seen by the motional branch (C0 added) within 1 %`, async () => {
      const { deck, nets } = acDeck(c, true);
      const z = await run(deck, nets.length);
      nets.forEach((net, k) => {
        const ours = impedanceSeenByMotionalBranch(net, c.c0F, c.freqHz);
        expect(Math.abs(ours.reOhm / z[k].re - 1)).toBeLessThan(0.01);
        expect(Math.abs(ours.imOhm / z[k].im - 1)).toBeLessThan(0.01);
      });
    });
  }
  it(`${engine}: the C0-free shortcut −gm/(ω²CaCb) misses the pins' resistance once a pin-to-pin stray is present`, async () => {
    const c = NETS[0];
    const { deck, nets } = acDeck(c, false);
    const z = await run(deck, nets.length);
    const w = 2 * Math.PI * c.freqHz;
    const shortcut = -nets[3].gmS / (w * w * nets[3].caF * nets[3].cbF);
    expect(Math.abs(shortcut / z[3].re - 1)).toBeGreaterThan(0.02);
  });
}

describe('Pierce network against a SPICE AC analysis (eecircuit-engine)', () => {
  acSuite('eecircuit-engine', engineAc);
});

describe.skipIf(!requireTool('ngspice'))('Pierce network against Debian ngspice', () => {
  acSuite('ngspice', ngspiceAc);
});

interface TranCase {
  name: string;
  fsHz: number;
  r1Ohm: number;
  c1F: number;
  c0F: number;
  net: PierceNetwork;
  /** Output current limit of the behavioural amplifier, A. */
  imaxA: number;
  /** Initial motional current, A. */
  i0A: number;
  note: string;
}

/**
 * Crystals: a 16 MHz AT strip (C1 5 fF, R1 40 Ω, C0 3 pF: Q ≈ 5·10⁴, the real Q) and a 32.768 kHz
 * fork (R1 40 kΩ, C0 1.3 pF, gm 5 µS as on a low-power RTC amplifier) whose C1 is raised from a
 * typical 2.5 fF to 20 fF (L1 from 9.4 kH to 1.18 kH): Q lowered from ≈5·10⁴ to ≈6·10³ so that the
 * transient covers a few time constants in about a hundred thousand steps.
 */
const TRAN: TranCase[] = [
  {
    name: '16 MHz AT',
    fsHz: 16e6,
    r1Ohm: 40,
    c1F: 5e-15,
    c0F: 3e-12,
    net: { gmS: 8e-3, caF: 12e-12 + 4.5e-12, cbF: 12e-12 + 5.5e-12, pinToPinF: 0.3e-12 },
    imaxA: 2e-3,
    i0A: 1e-8,
    note: 'real Q',
  },
  {
    name: '32.768 kHz fork',
    fsHz: 32768,
    r1Ohm: 40e3,
    c1F: 20e-15,
    c0F: 1.3e-12,
    net: { gmS: 5e-6, caF: 12e-12 + 6e-12, cbF: 12e-12 + 6e-12, pinToPinF: 0.5e-12 },
    imaxA: 5e-6,
    i0A: 1e-12,
    note: 'Q lowered to ≈6·10³',
  },
];

function tranDeck(
  c: TranCase,
  tauGuessS: number,
  stepsPerCycle: number,
): { deck: string; stopS: number; stepS: number } {
  const l1 = 1 / ((2 * Math.PI * c.fsHz) ** 2 * c.c1F);
  const stepS = 1 / (c.fsHz * stepsPerCycle);
  const stopS = 4 * tauGuessS;
  const deck = [
    `* behavioural pierce ${c.name}`,
    `B1 2 0 I = ${e(c.imaxA)}*tanh(${e(c.net.gmS / c.imaxA)}*v(1))`,
    `CA 1 0 ${e(c.net.caF)}`,
    `CB 2 0 ${e(c.net.cbF)}`,
    `CP 1 2 ${e(c.net.pinToPinF)}`,
    `C0 1 2 ${e(c.c0F)}`,
    `R1 1 3 ${e(c.r1Ohm)}`,
    `L1 3 4 ${e(l1)} ic=${e(c.i0A)}`,
    `C1 4 5 ${e(c.c1F)}`,
    'VS 5 2 dc 0',
    'RA 1 0 1e13',
    'RB 2 0 1e13',
    '.options reltol=1e-6 abstol=1e-18',
    `.tran ${e(stepS)} ${e(stopS)} 0 ${e(stepS)} uic`,
    '.control',
    'set numdgt=15',
    'run',
    'wrdata i.out i(vs)',
    'quit',
    '.endc',
    '.end',
    '',
  ].join('\n');
  return { deck, stopS, stepS };
}

/** τ of the envelope: least-squares slope of ln(peak |i|) against time over [from, to]. */
function envelopeTau(t: number[], i: number[], from: number, to: number): number {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let k = 1; k < i.length - 1; k++) {
    const a = Math.abs(i[k - 1]);
    const b = Math.abs(i[k]);
    const c = Math.abs(i[k + 1]);
    if (t[k] < from || t[k] > to || !(b >= a && b > c)) continue;
    // parabola through the three samples (uniform step assumed near the peak)
    const den = a - 2 * b + c;
    const shift = den !== 0 ? (0.5 * (a - c)) / den : 0;
    xs.push(t[k] + shift * (t[k + 1] - t[k]));
    ys.push(Math.log(b - 0.25 * (a - c) * shift));
  }
  const n = xs.length;
  const mx = xs.reduce((s, x) => s + x, 0) / n;
  const my = ys.reduce((s, y) => s + y, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let k = 0; k < n; k++) {
    sxy += (xs[k] - mx) * (ys[k] - my);
    sxx += (xs[k] - mx) ** 2;
  }
  return sxx / sxy;
}

function predictedTau(c: TranCase): { tauS: number; freqHz: number; motionalOhm: number } {
  const l1 = 1 / ((2 * Math.PI * c.fsHz) ** 2 * c.c1F);
  const freqHz = loopFrequencyHz(c.net, c.c0F, { fsHz: c.fsHz, c1F: c.c1F })!;
  const motionalOhm = impedanceSeenByMotionalBranch(c.net, c.c0F, freqHz).reOhm;
  return { tauS: startupTauS(l1, motionalOhm, c.r1Ohm), freqHz, motionalOhm };
}

async function engineTran(deck: string): Promise<{ t: number[]; i: number[] }> {
  const sim = await startEngine();
  sim.setNetList(deck.replace(/^\.control[\s\S]*?^\.endc\s*$/im, ''));
  const result = await sim.runSim();
  const errors = sim.getError();
  if (errors.length) throw new Error(`eecircuit-engine: ${errors.join('; ')}`);
  const col = (name: string) => {
    const d = result.data.find((x) => x.name.toLowerCase() === name);
    if (!d) throw new Error(`no vector ${name} (have ${result.data.map((x) => x.name).join(', ')})`);
    return d.values as number[];
  };
  return { t: col('time'), i: col('i(vs)') };
}

function ngspiceTran(deck: string): { t: number[]; i: number[] } {
  const rows = ngspiceRun(deck, 'i.out')
    .trim()
    .split('\n')
    .map((l) => l.trim().split(/\s+/).map(Number));
  return { t: rows.map((r) => r[0]), i: rows.map((r) => r[1]) };
}

function tranSuite(
  engine: string,
  run: (deck: string) => Promise<{ t: number[]; i: number[] }> | { t: number[]; i: number[] },
) {
  for (const c of TRAN) {
    it(`${engine}: ${c.name} (${c.note}) — τ = 2L1/(|Rm| − R1) within 10 % of the transient's envelope`, async () => {
      const p = predictedTau(c);
      expect(p.tauS).toBeGreaterThan(0);
      expect(Number.isFinite(p.tauS)).toBe(true);
      const { deck } = tranDeck(c, p.tauS, 40);
      const { t, i } = await run(deck);
      // Fit from 0.5τ (start-up transient of the other poles gone) to 3τ (amplitude ×20 from the
      // start: gm·v1 stays under 1 % of Imax, linear).
      const tau = envelopeTau(t, i, 0.5 * p.tauS, 3 * p.tauS);
      expect(Math.abs(tau / p.tauS - 1)).toBeLessThan(0.1);
    }, 120_000);
  }
}

describe('start-up time constant against a SPICE transient of a behavioural Pierce circuit (eecircuit-engine)', () => {
  tranSuite('eecircuit-engine', engineTran);
});

describe.skipIf(!requireTool('ngspice'))('start-up time constant against Debian ngspice', () => {
  tranSuite('ngspice', ngspiceTran);
});
