/**
 * The demo catalogue: documented model values of every demo part, per sample, and how each
 * sweep file is synthesised from them. scripts/make-demo.ts writes content/parts/ from this
 * table; test/demo/demo-recovery.test.ts checks that extraction recovers these values.
 *
 * Scenario (invented): the hardware group of Kestrelmoor Buoyworks, a fictional maker of
 * ocean data buoys, characterises the resonators it buys for its loggers, modems and
 * sensor boards. Suppliers and part numbers are invented: Brimwell Quartzworks (leaded
 * HC-49 crystals), Tavistrand Crystal (SMD crystals), Calderwick Timing (32.768 kHz forks),
 * Pellowin Ceramics (ceramic resonators), Orrinbay Acoustic (SAW resonators). Everything
 * here is synthetic demo data, not a measurement of any real part.
 *
 * Model values sit in typical ranges for each kind of part (from memory; plausibility only), and
 * each part's fs is chosen so that at its datasheet load capacitance it lies within the datasheet
 * tolerance (lossless fL = fs·√(1 + C1/(C0 + CL)), IEC 60444-11 term fL, form derived from the BVD
 * model), except where `scenario.fails` says so.
 */
import type { BvdModel, MotionalBranch } from '../../src/lib/models/bvd.ts';
import type { SynthFileFormat } from '../../src/lib/synth/synth-file.ts';
import type { TouchstoneFormat, TouchstoneFreqUnit } from '../../src/lib/io/touchstone.ts';
import {
  antiResonanceHz,
  atCutOffset,
  bandwidthHz,
  fsForNominal,
  loadFrequencyHz,
  narrowGrid,
  spanGrid,
  wideGrid,
} from './demo-physics.ts';
import type { DemoPart, DemoSample, DemoSweep } from './demo-types.ts';

export type { DemoPart, DemoSample, DemoSweep, DemoMode } from './demo-types.ts';

// ------------------------------------------------------------------ shorthands

const pF = 1e-12;
const fF = 1e-15;
const uW = 1e-6;

const branch = (fsHz: number, r1Ohm: number, c1F: number): MotionalBranch => ({ fsHz, r1Ohm, c1F });
const ts1 = (format: TouchstoneFormat, freqUnit: TouchstoneFreqUnit): SynthFileFormat => ({
  kind: 'touchstone',
  version: 1,
  format,
  freqUnit,
});
const ts2 = (format: TouchstoneFormat, freqUnit: TouchstoneFreqUnit): SynthFileFormat => ({
  kind: 'touchstone',
  version: 2,
  format,
  freqUnit,
});
const csv = (
  form: 'rx' | 'magphase',
  delimiter: ',' | ';' | '\t' = ',',
  freqUnit: TouchstoneFreqUnit = 'Hz',
): SynthFileFormat => ({ kind: 'csv', form, delimiter, freqUnit });

/** A one-mode quartz model at `offsetPpm` from nominal at the given load. */
function quartz(
  nominalHz: number,
  offsetPpm: number,
  r1Ohm: number,
  c1F: number,
  c0F: number,
  clF: number | 'series',
): BvdModel {
  return { c0F, branches: [branch(fsForNominal(nominalHz, offsetPpm, c1F, c0F, clF), r1Ohm, c1F)] };
}

/** The model with branch k's fs moved by `ppm` and (optionally) its R1 replaced. */
function shifted(model: BvdModel, k: number, ppm: number, r1Ohm?: number): BvdModel {
  return {
    ...model,
    branches: model.branches.map((b, i) =>
      i === k ? { ...b, fsHz: b.fsHz * (1 + ppm * 1e-6), r1Ohm: r1Ohm ?? b.r1Ohm } : b,
    ),
  };
}

/** Narrow sweep around branch k of a model (±6 bandwidths, ≥ 16 points per bandwidth unless told). */
function narrowAround(model: BvdModel, k = 0, opts: { halfWidthBw?: number; perBw?: number } = {}) {
  return narrowGrid(model.branches[k].fsHz, bandwidthHz(model.branches[k]), opts);
}

const MAIN = [{ branch: 0, overtone: 1, spurious: false }];

const INSTRUMENT = {
  network: 'bench network analyser, 50 ohm',
  socket: 'bench network analyser with an SMD test socket',
  impedance: 'bench impedance analyser',
  chamber: 'bench network analyser, part in a temperature chamber',
  old: 'older bench network analyser (specified to 100 MHz)',
};

// ------------------------------------------------------------------ parts

const parts: DemoPart[] = [];

// 1. Tuning fork in a 3215 package, impedance analyser, CSV (R/X and |Z|/phase).
{
  const model: BvdModel = {
    c0F: 1.25 * pF,
    branches: [branch(fsForNominal(32768, 6, 3.1 * fF, 1.25 * pF, 12.5 * pF), 42e3, 3.1 * fF)],
  };
  parts.push({
    id: 'tf-32k-3215',
    title: '32.768 kHz tuning fork, 3215 SMD',
    kind: 'quartz-tuning-fork',
    package: '3215',
    supplier: 'Calderwick Timing',
    supplierPart: 'CW-TF3215-12',
    notes:
      'Real-time clock of the logger board. Measured on the impedance analyser at very low drive: forks are damaged by microwatts.',
    datasheet: {
      frequency: '32.768 kHz',
      tolerance: '20 ppm',
      loadCapacitance: '12.5 pF',
      esrMax: '70 kohm',
      c0Max: '1.6 pF',
      driveMax: '0.5 uW',
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'a 32.768 kHz tuning fork measured as impedance, CSV files in R/X and |Z|/phase form' },
    samples: [
      {
        id: 'A1',
        measured: '2026-02-03',
        by: 'RN',
        instrument: INSTRUMENT.impedance,
        temperatureC: 25,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.csv',
            fixture: 'impedance',
            format: csv('rx'),
            grid: narrowAround(model),
            noiseDb: -72,
            driveW: 0.05 * uW,
          },
          {
            file: 'a1-wide.csv',
            fixture: 'impedance',
            format: csv('magphase'),
            grid: wideGrid(model),
            noiseDb: -72,
            driveW: 0.05 * uW,
          },
        ],
      },
    ],
  });
}

// 2. Tuning fork in a 2×6 mm cylinder, series-through, Touchstone 1 DB in kHz.
{
  const model = quartz(32768, -8, 31e3, 2.2 * fF, 0.9 * pF, 6 * pF);
  parts.push({
    id: 'tf-32k-cyl',
    title: '32.768 kHz tuning fork, 2×6 mm cylinder, 6 pF',
    kind: 'quartz-tuning-fork',
    package: '2x6 cylinder',
    supplier: 'Calderwick Timing',
    supplierPart: 'CW-TC26-6',
    notes: 'Low-load fork for the low-power wake-up timer. Series-through fixture: the fork is high impedance.',
    datasheet: {
      frequency: '32.768 kHz',
      tolerance: '20 ppm',
      loadCapacitance: '6 pF',
      esrMax: '50 kohm',
      c0Max: '1.2 pF',
      driveMax: '1 uW',
      operatingRange: '-20 to 70 C',
    },
    scenario: { shows: 'a series-through 2-port measurement of a tuning fork, Touchstone 1 in dB/angle and kHz' },
    samples: [
      {
        id: 'A1',
        measured: '2026-02-04',
        by: 'RN',
        instrument: INSTRUMENT.network,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'series-thru',
            format: ts1('DB', 'kHz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 0.1 * uW,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts1('DB', 'kHz'),
            grid: wideGrid(model),
            noiseDb: -70,
            driveW: 0.1 * uW,
          },
        ],
      },
    ],
  });
}

// 3. 4 MHz HC-49/U: reflection narrow (MA, kHz), series-through wide (RI, Hz).
{
  const model = quartz(4e6, 12, 62, 22 * fF, 5.4 * pF, 20 * pF);
  parts.push({
    id: 'xt-4m-hc49u',
    title: '4 MHz crystal, HC-49/U, 20 pF',
    kind: 'quartz-at',
    package: 'HC-49/U',
    supplier: 'Brimwell Quartzworks',
    supplierPart: 'BQW-4U-4M000-B',
    notes:
      'Clock of the legacy depth-sounder interface. Narrow sweep on the reflection bridge, wide sweep in the series-through fixture.',
    datasheet: {
      frequency: '4 MHz',
      tolerance: '30 ppm',
      stability: '30 ppm',
      loadCapacitance: '20 pF',
      esrMax: '150 ohm',
      c0Max: '7 pF',
      driveMax: '1 mW',
      overtone: 1,
      operatingRange: '-20 to 70 C',
    },
    scenario: { shows: 'a 1-port reflection sweep (Touchstone 1, magnitude/angle, kHz) next to a 2-port wide sweep' },
    samples: [
      {
        id: 'A1',
        measured: '2026-01-20',
        by: 'MO',
        instrument: INSTRUMENT.network,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s1p',
            fixture: 'reflection',
            format: ts1('MA', 'kHz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts1('RI', 'Hz'),
            grid: wideGrid(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

// 4. 8 MHz HC-49/S: series-through, Touchstone 1 RI in MHz.
{
  const model = quartz(8e6, -9, 34, 14 * fF, 4.1 * pF, 18 * pF);
  parts.push({
    id: 'xt-8m-hc49s',
    title: '8 MHz crystal, HC-49/S, 18 pF',
    kind: 'quartz-at',
    package: 'HC-49/S',
    supplier: 'Brimwell Quartzworks',
    supplierPart: 'BQW-4S-8M000-A',
    notes: 'Main clock of the sonar front end.',
    datasheet: {
      frequency: '8 MHz',
      tolerance: '30 ppm',
      stability: '30 ppm',
      loadCapacitance: '18 pF',
      esrMax: '80 ohm',
      c0Max: '7 pF',
      driveMax: '500 uW',
      overtone: 1,
      operatingRange: '-20 to 70 C',
    },
    scenario: { shows: 'a plain series-through measurement, Touchstone 1 real/imaginary in MHz' },
    samples: [
      {
        id: 'A1',
        measured: '2026-01-21',
        by: 'MO',
        instrument: INSTRUMENT.network,
        temperatureC: 23,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'series-thru',
            format: ts1('RI', 'MHz'),
            grid: narrowAround(model),
            noiseDb: -68,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts1('RI', 'MHz'),
            grid: wideGrid(model),
            noiseDb: -68,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

// 5. 10 MHz HC-49/S with a spurious mode about 52 kHz above the main resonance.
{
  const main = quartz(10e6, 6, 14, 16 * fF, 4.2 * pF, 18 * pF);
  const model: BvdModel = {
    ...main,
    branches: [...main.branches, branch(main.branches[0].fsHz + 52_300, 180, 1.3 * fF)],
  };
  parts.push({
    id: 'xt-10m-hc49s-spur',
    title: '10 MHz crystal, HC-49/S, with a spurious mode',
    kind: 'quartz-at',
    package: 'HC-49/S',
    supplier: 'Brimwell Quartzworks',
    supplierPart: 'BQW-4S-10M00-A',
    notes:
      'Reference for the modem PLL. An unwanted mode about 52 kHz above the main resonance shows in every sample of this batch; a narrow sweep was taken around it as well.',
    datasheet: {
      frequency: '10 MHz',
      tolerance: '30 ppm',
      stability: '30 ppm',
      loadCapacitance: '18 pF',
      esrMax: '60 ohm',
      c0Max: '7 pF',
      driveMax: '500 uW',
      overtone: 1,
      operatingRange: '-20 to 70 C',
    },
    scenario: { shows: 'a spurious (unwanted) mode next to the main mode, Touchstone 1 magnitude/angle in kHz' },
    samples: [
      {
        id: 'A1',
        measured: '2026-01-22',
        by: 'MO',
        instrument: INSTRUMENT.network,
        model,
        modes: [
          { branch: 0, overtone: 1, spurious: false },
          { branch: 1, overtone: 1, spurious: true },
        ],
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'series-thru',
            format: ts1('MA', 'kHz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-spur.s2p',
            fixture: 'series-thru',
            format: ts1('MA', 'kHz'),
            grid: narrowAround(model, 1),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts1('MA', 'kHz'),
            grid: wideGrid(model, 0, { above: 3 }),
            noiseDb: -70,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

// 6. 12 MHz 3225 in an SMD test socket, with open/short compensation sweeps.
{
  const model = quartz(12e6, 3, 28, 7.5 * fF, 2.1 * pF, 8 * pF);
  const wide = wideGrid(model);
  const span = wide.kind === 'linear' ? [wide.startHz - 10e3, wide.stopHz + 10e3] : [0, 0];
  parts.push({
    id: 'xt-12m-3225-socket',
    title: '12 MHz crystal, 3225 SMD, measured in a test socket',
    kind: 'quartz-at',
    package: '3225',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX32-12M-08',
    notes:
      'Sensor-board clock. Measured in a spring-contact SMD socket whose stray capacitance (about 0.45 pF) and series inductance would otherwise add to C0 and shift fs; the open and short sweeps of the empty and shorted socket remove them. Sweeps averaged 16 times: subtracting the socket capacitance makes the anti-resonance region sensitive to noise.',
    datasheet: {
      frequency: '12 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '8 pF',
      esrMax: '60 ohm',
      c0Max: '3 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'open/short fixture compensation (socket residuals Rs = 0.35 Ω, Ls = 4.5 nH, Cp = 0.45 pF)' },
    samples: [
      {
        id: 'A1',
        measured: '2026-03-02',
        by: 'TK',
        instrument: INSTRUMENT.socket,
        model,
        modes: MAIN,
        parasitics: { rsOhm: 0.35, lsH: 4.5e-9, cpF: 0.45 * pF },
        compensation: {
          fixture: 'series-thru',
          format: ts1('DB', 'Hz'),
          noiseDb: -85,
          open: 'socket-open.s2p',
          short: 'socket-short.s2p',
          grid: { kind: 'linear', startHz: span[0], stopHz: span[1], points: 401 },
        },
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'series-thru',
            format: ts1('DB', 'Hz'),
            grid: narrowAround(model),
            noiseDb: -80,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts1('DB', 'Hz'),
            grid: wide,
            noiseDb: -80,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

// 7. 16 MHz 3225, six samples from two lots, one outlier.
{
  const lots: Array<[string, string, number, number, number, number]> = [
    // id, lot, offset ppm at CL, R1 Ω, C1 fF, C0 pF
    ['A1', '2025-W48', 3.1, 25.8, 5.62, 1.91],
    ['A2', '2025-W48', 1.4, 27.9, 5.55, 1.89],
    ['A3', '2025-W48', 4.6, 26.4, 5.71, 1.93],
    ['B1', '2026-W06', -2.2, 28.8, 5.48, 1.88],
    ['B2', '2026-W06', 7.2, 52.5, 5.12, 1.86], // the outlier: twice the R1 of its lot mates, lower C1
    ['B3', '2026-W06', -0.8, 29.6, 5.51, 1.9],
  ];
  const samples: DemoSample[] = lots.map(([id, lot, ppm, r1, c1, c0], i) => {
    const model = quartz(16e6, ppm, r1, c1 * fF, c0 * pF, 10 * pF);
    const lower = id.toLowerCase();
    return {
      id,
      lot,
      measured: i < 3 ? '2025-12-09' : '2026-02-17',
      by: i < 3 ? 'AJ' : 'TK',
      instrument: INSTRUMENT.network,
      model,
      modes: MAIN,
      sweeps: [
        {
          file: `${lower}-narrow.s1p`,
          fixture: 'reflection',
          format: ts1('RI', 'Hz'),
          grid: narrowAround(model),
          noiseDb: -70,
          driveW: 10 * uW,
          recordReferenceImpedance: true,
        },
        {
          file: `${lower}-wide.s1p`,
          fixture: 'impedance',
          format: ts1('RI', 'Hz'),
          parameter: 'Z',
          grid: wideGrid(model, 0, { points: 1601 }),
          noiseDb: -70,
          driveW: 10 * uW,
        },
      ],
    };
  });
  parts.push({
    id: 'xt-16m-3225-lots',
    title: '16 MHz crystal, 3225 SMD, 10 pF — two lots',
    kind: 'quartz-at',
    package: '3225',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX32-16M-10E',
    notes:
      'Radio-modem reference. Three samples from each of two delivery lots; sample B2 is an outlier with about twice the motional resistance of its lot mates (still inside the datasheet limit).',
    datasheet: {
      frequency: '16 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '10 pF',
      esrMax: '60 ohm',
      c0Max: '3 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: {
      shows: 'several samples from two lots with one outlier; reflection S11 and Z-parameter Touchstone files',
    },
    samples,
  });
}

// 8. 16 MHz 2520 over temperature (AT-cut cubic, angle offset +2′).
{
  // Gerber & Ballato (eds.), Precision Frequency Control, Academic Press 1985, as quoted in
  // M. Haney's 2001 thesis: a1 = −5.08e-6/°C per degree of angle offset (here +2′ = 1/30 °), a2 = −0.45e-9/°C², a3 = 108.6e-12/°C³.
  const coeffs = [(-5.08e-6 * 2) / 60, -0.45e-9, 108.6e-12] as const;
  const model = quartz(16e6, -2.5, 38, 4.2 * fF, 1.6 * pF, 8 * pF);
  const temps = [-40, -20, 0, 25, 50, 70, 85];
  const sweeps: DemoSweep[] = temps.map((t) => {
    const m = shifted(model, 0, atCutOffset(t, coeffs) * 1e6);
    const name = t < 0 ? `m${-t}` : `${t}`;
    return {
      file: `a1-t${name}c.s2p`,
      fixture: 'series-thru',
      format: ts2('MA', 'MHz'),
      grid: narrowAround(m),
      noiseDb: -70,
      temperatureC: t,
      driveW: 10 * uW,
      model: t === 25 ? undefined : m,
    };
  });
  sweeps.push({
    file: 'a1-wide-25c.s2p',
    fixture: 'series-thru',
    format: ts2('MA', 'MHz'),
    grid: wideGrid(model),
    noiseDb: -70,
    temperatureC: 25,
    driveW: 10 * uW,
  });
  parts.push({
    id: 'xt-16m-2520-temp',
    title: '16 MHz crystal, 2520 SMD, over temperature',
    kind: 'quartz-at',
    package: '2520',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX25-16M-08T',
    notes:
      'Candidate for the buoy transmitter, which sees −40 °C on deck in winter. Narrow sweeps at seven chamber temperatures, a wide sweep at 25 °C.',
    datasheet: {
      frequency: '16 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '8 pF',
      esrMax: '80 ohm',
      c0Max: '2.5 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: {
      shows: 'frequency against temperature (AT-cut cubic), Touchstone 2 files',
      temperatureCoefficients: coeffs,
    },
    samples: [
      {
        id: 'A1',
        measured: '2026-03-16',
        by: 'AJ',
        instrument: INSTRUMENT.chamber,
        temperatureC: 25,
        model,
        modes: MAIN,
        sweeps,
      },
    ],
  });
}

// 9. 20 MHz 2520 at five drive levels (R1 a little higher at low drive: drive-level dependence).
{
  const levels = [
    { driveW: 0.5 * uW, r1Ohm: 33.5, offsetPpm: 0 },
    { driveW: 2 * uW, r1Ohm: 31.2, offsetPpm: 0.01 },
    { driveW: 10 * uW, r1Ohm: 29.4, offsetPpm: 0.05 },
    { driveW: 50 * uW, r1Ohm: 28.9, offsetPpm: 0.22 },
    { driveW: 100 * uW, r1Ohm: 28.8, offsetPpm: 0.45 },
  ] as const;
  const model = quartz(20e6, 4, levels[0].r1Ohm, 3.9 * fF, 1.45 * pF, 8 * pF);
  const sweeps: DemoSweep[] = levels.map((l, i) => {
    const m = shifted(model, 0, l.offsetPpm, l.r1Ohm);
    const uw = l.driveW / uW;
    return {
      file: `a1-drive-${String(uw).replace('.', 'p')}uw.s2p`,
      fixture: 'shunt-thru',
      format: ts1('DB', 'GHz'),
      grid: narrowAround(m),
      noiseDb: -70,
      driveW: l.driveW,
      model: i === 0 ? undefined : m,
    };
  });
  sweeps.push({
    file: 'a1-wide.s2p',
    fixture: 'series-thru',
    format: ts2('RI', 'Hz'),
    grid: wideGrid(model),
    noiseDb: -70,
    driveW: levels[0].driveW,
  });
  parts.push({
    id: 'xt-20m-2520-dld',
    title: '20 MHz crystal, 2520 SMD, drive-level sweep',
    kind: 'quartz-at',
    package: '2520',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX25-20M-08',
    notes:
      'Microcontroller clock of the wave-height sensor. Swept at five drive levels from 0.5 µW to 100 µW: the motional resistance is about 16 % higher at the lowest level (a mild drive-level dependence), and the frequency rises slightly with drive.',
    datasheet: {
      frequency: '20 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '8 pF',
      esrMax: '60 ohm',
      c0Max: '2.5 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: {
      shows: 'drive-level dependence (R1 against drive), shunt-through in dB/angle and GHz',
      driveLevels: levels,
    },
    samples: [
      { id: 'A1', measured: '2026-03-18', by: 'AJ', instrument: INSTRUMENT.network, model, modes: MAIN, sweeps },
    ],
  });
}

// 10. 24 MHz 2016: borderline, both samples fail the datasheet ESR.
{
  const samples: DemoSample[] = [
    ['A1', 64.5, 3.1, 1.2, 2.5],
    ['A2', 62.1, 3.15, 1.22, -1.5],
  ].map(([id, r1, c1, c0, ppm]) => {
    const model = quartz(24e6, ppm as number, r1 as number, (c1 as number) * fF, (c0 as number) * pF, 8 * pF);
    const lower = (id as string).toLowerCase();
    return {
      id: id as string,
      measured: '2026-04-07',
      by: 'TK',
      instrument: INSTRUMENT.impedance,
      model,
      modes: MAIN,
      sweeps: [
        {
          file: `${lower}-narrow.csv`,
          fixture: 'impedance',
          format: csv('rx', ',', 'MHz'),
          grid: narrowAround(model),
          noiseDb: -70,
          driveW: 10 * uW,
        },
        {
          file: `${lower}-wide.csv`,
          fixture: 'impedance',
          format: csv('rx', ',', 'MHz'),
          grid: wideGrid(model),
          noiseDb: -70,
          driveW: 10 * uW,
        },
      ],
    };
  });
  parts.push({
    id: 'xt-24m-2016-esr',
    title: '24 MHz crystal, 2016 SMD — over its ESR limit',
    kind: 'quartz-at',
    package: '2016',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX20-24M-08',
    notes:
      'Proposed for the smaller sensor board. Both samples measure a few per cent above the 60 ohm ESR limit of the datasheet: borderline, raised with the supplier before approval.',
    datasheet: {
      frequency: '24 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '8 pF',
      esrMax: '60 ohm',
      c0Max: '2 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'a borderline part that fails its datasheet ESR', fails: ['esrMax'] },
    samples,
  });
}

// 11. 25 MHz 3225 with known capacitors added in parallel and in series (load-capacitance shift).
{
  const model = quartz(25e6, 2, 22, 4.8 * fF, 1.75 * pF, 12 * pF);
  const b = model.branches[0];
  const bw = bandwidthHz(b);
  const loaded = (clF: number, connection: 'parallel' | 'series'): DemoSweep => ({
    file: `a1-${connection === 'parallel' ? 'par' : 'ser'}-${clF / pF}pf.s2p`,
    fixture: 'series-thru',
    format: ts1('RI', 'Hz'),
    // From fs to past fL: the part's own resonance and the load (anti-)resonance in one sweep.
    grid: spanGrid(b.fsHz - 6 * bw, loadFrequencyHz(b, model.c0F, clF) + 6 * bw, bw),
    noiseDb: -70,
    driveW: 10 * uW,
    added: { capacitanceF: clF, connection },
  });
  parts.push({
    id: 'xt-25m-3225-load',
    title: '25 MHz crystal, 3225 SMD, with load-capacitance sweeps',
    kind: 'quartz-at',
    package: '3225',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX32-25M-12',
    notes:
      'Ethernet PHY clock of the shore station. Besides the plain sweeps, four sweeps with a known C0G capacitor (8 pF and 12 pF) across the crystal and in series with it, to read C1 and C0 from the load shift.',
    datasheet: {
      frequency: '25 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '12 pF',
      esrMax: '50 ohm',
      c0Max: '3 pF',
      driveMax: '200 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'load-capacitance shift with added capacitors, parallel and series' },
    samples: [
      {
        id: 'A1',
        measured: '2026-04-14',
        by: 'MO',
        instrument: INSTRUMENT.network,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'series-thru',
            format: ts1('RI', 'Hz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts1('RI', 'Hz'),
            grid: wideGrid(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          loaded(8 * pF, 'parallel'),
          loaded(12 * pF, 'parallel'),
          loaded(8 * pF, 'series'),
          loaded(12 * pF, 'series'),
        ],
      },
    ],
  });
}

// 12. 26 MHz 2016: tab-separated |Z|/phase from the impedance analyser.
{
  const model = quartz(26e6, -3.5, 35, 3.4 * fF, 1.15 * pF, 7 * pF);
  parts.push({
    id: 'xt-26m-2016',
    title: '26 MHz crystal, 2016 SMD, 7 pF',
    kind: 'quartz-at',
    package: '2016',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX20-26M-07',
    notes: 'Clock of the satellite-modem module. Exported from the impedance analyser as tab-separated |Z| and phase.',
    datasheet: {
      frequency: '26 MHz',
      tolerance: '10 ppm',
      stability: '15 ppm',
      loadCapacitance: '7 pF',
      esrMax: '60 ohm',
      c0Max: '2 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-30 to 85 C',
    },
    scenario: { shows: 'a tab-separated |Z|/phase export' },
    samples: [
      {
        id: 'A1',
        measured: '2026-04-21',
        by: 'TK',
        instrument: INSTRUMENT.impedance,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.tsv',
            fixture: 'impedance',
            format: csv('magphase', '\t', 'MHz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.tsv',
            fixture: 'impedance',
            format: csv('magphase', '\t', 'MHz'),
            grid: wideGrid(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

// 13. 27 MHz 3225: a 2-port file holding a reflection measurement, and a Y-parameter file.
{
  const model = quartz(27e6, 1.5, 26, 4.4 * fF, 1.7 * pF, 10 * pF);
  parts.push({
    id: 'xt-27m-3225',
    title: '27 MHz crystal, 3225 SMD, 10 pF',
    kind: 'quartz-at',
    package: '3225',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX32-27M-10',
    notes:
      'Short-range telemetry link. The narrow sweep was saved as a 2-port file with the crystal on port 1 only; the wide sweep as admittance (Y) parameters.',
    datasheet: {
      frequency: '27 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '10 pF',
      esrMax: '40 ohm',
      c0Max: '3 pF',
      driveMax: '200 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'a reflection measurement stored in a 2-port file, and a Y-parameter Touchstone file' },
    samples: [
      {
        id: 'A1',
        measured: '2026-04-22',
        by: 'MO',
        instrument: INSTRUMENT.network,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'reflection',
            ports: 2,
            format: ts1('MA', 'MHz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide-y.s1p',
            fixture: 'impedance',
            parameter: 'Y',
            format: ts1('RI', 'MHz'),
            grid: wideGrid(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

// 14. 40 MHz 2016 with a third-overtone sweep above the instrument's range.
{
  const fund = quartz(40e6, -4, 24, 2.8 * fF, 1.3 * pF, 8 * pF);
  // Third overtone near 3·f1·1.0028 (piezoelectric stiffening estimate, from memory), C1/9 and a higher R.
  const model: BvdModel = {
    ...fund,
    branches: [...fund.branches, branch(3 * fund.branches[0].fsHz * 1.0028, 72, 0.33 * fF)],
  };
  parts.push({
    id: 'xt-40m-2016-range',
    title: '40 MHz crystal, 2016 SMD — overtone swept above the analyser range',
    kind: 'quartz-at',
    package: '2016',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX20-40M-08',
    notes:
      'Data-logger FPGA clock. To check for a strong third overtone a sweep was taken around 120 MHz, beyond the 100 MHz the old analyser is specified for: the overtone data are shown but flagged, not trusted. Semicolon-separated export.',
    datasheet: {
      frequency: '40 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '8 pF',
      esrMax: '50 ohm',
      c0Max: '2 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'a sweep above the instrument range (instrumentMaxFrequency), semicolon-separated CSV' },
    samples: [
      {
        id: 'A1',
        measured: '2026-05-05',
        by: 'RN',
        instrument: INSTRUMENT.old,
        instrumentMaxFrequencyHz: 100e6,
        model,
        modes: [
          { branch: 0, overtone: 1, spurious: false },
          { branch: 1, overtone: 3, spurious: false, aboveInstrumentRange: true },
        ],
        sweeps: [
          {
            file: 'a1-narrow.csv',
            fixture: 'impedance',
            format: csv('rx', ';', 'Hz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.csv',
            fixture: 'impedance',
            format: csv('rx', ';', 'Hz'),
            grid: wideGrid(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-overtone3.csv',
            fixture: 'impedance',
            format: csv('rx', ';', 'Hz'),
            grid: narrowAround(model, 1),
            noiseDb: -70,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

// 15. 50 MHz third-overtone HC-49/S; its fundamental near 16.6 MHz is in the wide sweep.
{
  const c0F = 3.6 * pF;
  const f3 = fsForNominal(50e6, 4, 1.15 * fF, c0F, 'series');
  const f1 = (f3 / 3 / 1.0028) * (1 + 35e-6); // f3/(3f1) ≈ 1.0028 (stiffening estimate, from memory), here with a little trapping offset
  const model: BvdModel = { c0F, branches: [branch(f1, 11, 10.5 * fF), branch(f3, 36, 1.15 * fF)] };
  const bw1 = bandwidthHz(model.branches[0]);
  const bw3 = bandwidthHz(model.branches[1]);
  const fa1 = antiResonanceHz(model, 0);
  const fa3 = antiResonanceHz(model, 1);
  // A segment sweep: sparse over 12…56 MHz, dense over each mode and its anti-resonance.
  const wide = {
    kind: 'segments' as const,
    segments: [
      { kind: 'linear' as const, startHz: 12e6, stopHz: 56e6, points: 441 },
      {
        kind: 'linear' as const,
        startHz: Math.round(f1 - 8 * bw1),
        stopHz: Math.round(fa1 + 8 * bw1),
        points: Math.ceil((fa1 - f1 + 16 * bw1) / (bw1 / 4)),
      },
      {
        kind: 'linear' as const,
        startHz: Math.round(f3 - 8 * bw3),
        stopHz: Math.round(fa3 + 8 * bw3),
        points: Math.ceil((fa3 - f3 + 16 * bw3) / (bw3 / 6)),
      },
    ],
  };
  parts.push({
    id: 'xt-50m-hc49s-ot3',
    title: '50 MHz third-overtone crystal, HC-49/S',
    kind: 'quartz-at',
    package: 'HC-49/S',
    supplier: 'Brimwell Quartzworks',
    supplierPart: 'BQW-4S-50M00-3',
    notes:
      'Local oscillator of the VHF receiver, a third-overtone crystal specified at series resonance. Its fundamental near 16.6 MHz is stronger (lower R1) than the wanted mode: the oscillator needs a selective network to stay on the overtone.',
    datasheet: {
      frequency: '50 MHz',
      tolerance: '20 ppm',
      stability: '25 ppm',
      loadCapacitance: 'series',
      esrMax: '60 ohm',
      c0Max: '7 pF',
      driveMax: '500 uW',
      overtone: 3,
      operatingRange: '-20 to 70 C',
    },
    scenario: { shows: 'a third-overtone part with its fundamental in a wide segment sweep, Touchstone 2 two-port' },
    samples: [
      {
        id: 'A1',
        measured: '2026-05-11',
        by: 'RN',
        instrument: INSTRUMENT.network,
        model,
        modes: [
          { branch: 0, overtone: 1, spurious: false },
          { branch: 1, overtone: 3, spurious: false },
        ],
        sweeps: [
          {
            file: 'a1-ot3-narrow.s1p',
            fixture: 'reflection',
            format: ts1('RI', 'MHz'),
            grid: narrowAround(model, 1),
            noiseDb: -70,
            driveW: 20 * uW,
          },
          {
            file: 'a1-fund-narrow.s1p',
            fixture: 'reflection',
            format: ts1('RI', 'MHz'),
            grid: narrowAround(model, 0),
            noiseDb: -70,
            driveW: 20 * uW,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts2('RI', 'MHz'),
            grid: wide,
            noiseDb: -70,
            driveW: 20 * uW,
          },
        ],
      },
    ],
  });
}

// 16. 4 MHz ceramic resonator: |Z|/phase CSV from the impedance analyser.
{
  const model = quartz(4e6, 900, 8, 4.1 * pF, 20.6 * pF, 30 * pF);
  parts.push({
    id: 'cer-4m',
    title: '4 MHz ceramic resonator, 2-terminal',
    kind: 'ceramic',
    package: 'radial 2-pin',
    supplier: 'Pellowin Ceramics',
    supplierPart: 'PLC-4M00-R2',
    notes:
      'Cheap clock for the bilge-pump controller, where ±0.5 % is plenty. Ceramic resonators have a large C1/C0 and a low Q: the anti-resonance is about 9 % above fs.',
    datasheet: {
      frequency: '4 MHz',
      tolerance: '5000 ppm',
      stability: '3000 ppm',
      loadCapacitance: '30 pF',
      esrMax: '30 ohm',
      c0Max: '30 pF',
      operatingRange: '-20 to 80 C',
    },
    scenario: { shows: 'a ceramic resonator (low Q, large C1), |Z|/phase CSV' },
    samples: [
      {
        id: 'A1',
        measured: '2026-01-13',
        by: 'RN',
        instrument: INSTRUMENT.impedance,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.csv',
            fixture: 'impedance',
            format: csv('magphase', ',', 'kHz'),
            grid: narrowAround(model),
            noiseDb: -70,
          },
          {
            file: 'a1-wide.csv',
            fixture: 'impedance',
            format: csv('magphase', ',', 'kHz'),
            grid: wideGrid(model),
            noiseDb: -70,
          },
        ],
      },
    ],
  });
}

// 17. 8 MHz ceramic resonator: shunt-through narrow sweep (low impedance), series-through wide sweep.
{
  const model = quartz(8e6, -1200, 12, 2.4 * pF, 14 * pF, 15 * pF);
  parts.push({
    id: 'cer-8m',
    title: '8 MHz ceramic resonator, 2-terminal',
    kind: 'ceramic',
    package: 'radial 2-pin',
    supplier: 'Pellowin Ceramics',
    supplierPart: 'PLC-8M00-R2',
    notes:
      'Clock of the hatch-sensor microcontroller. The low impedance at resonance suits the shunt-through fixture; the wide sweep used the series-through fixture.',
    datasheet: {
      frequency: '8 MHz',
      tolerance: '5000 ppm',
      stability: '3000 ppm',
      loadCapacitance: '15 pF',
      esrMax: '40 ohm',
      c0Max: '20 pF',
      operatingRange: '-20 to 80 C',
    },
    scenario: { shows: 'a shunt-through measurement of a low-impedance resonator' },
    samples: [
      {
        id: 'A1',
        measured: '2026-01-14',
        by: 'RN',
        instrument: INSTRUMENT.network,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'shunt-thru',
            format: ts1('RI', 'Hz'),
            grid: narrowAround(model),
            noiseDb: -70,
          },
          {
            file: 'a1-wide.s2p',
            fixture: 'series-thru',
            format: ts1('RI', 'Hz'),
            grid: wideGrid(model, 0, { points: 1601 }),
            noiseDb: -70,
          },
        ],
      },
    ],
  });
}

// 18. 433.92 MHz SAW resonator, 1-port reflection in dB/angle and GHz.
{
  // Consistency check L1 = 1/((2πfs)²C1): 433.92 MHz with L1 = 50 µH gives C1 = 2.690611 fF.
  const model = quartz(433.92e6, -18, 17, 2.690611 * fF, 2.3 * pF, 'series');
  parts.push({
    id: 'saw-434',
    title: '433.92 MHz SAW resonator, 1-port',
    kind: 'saw',
    package: '5.0 x 3.5 SMD',
    supplier: 'Orrinbay Acoustic',
    supplierPart: 'OAS-R434-1',
    notes:
      'Resonator of the short-range buoy-to-buoy beacon transmitter. One-port SAW resonator, measured by reflection.',
    datasheet: {
      frequency: '433.92 MHz',
      tolerance: '170 ppm',
      loadCapacitance: 'series',
      esrMax: '26 ohm',
      c0Max: '3 pF',
      driveMax: '1 mW',
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'a SAW resonator, 1-port reflection in dB/angle with frequencies in GHz' },
    samples: [
      {
        id: 'A1',
        measured: '2026-05-19',
        by: 'MO',
        instrument: INSTRUMENT.network,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s1p',
            fixture: 'reflection',
            format: ts1('DB', 'GHz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 100 * uW,
          },
          {
            file: 'a1-wide.s1p',
            fixture: 'reflection',
            format: ts1('DB', 'GHz'),
            grid: wideGrid(model, 0, { below: 3, above: 3, points: 1601 }),
            noiseDb: -70,
            driveW: 100 * uW,
          },
        ],
      },
    ],
  });
}

// 19. 14.7456 MHz HC-49/S: Touchstone 2 one-port files, two samples.
{
  const samples: DemoSample[] = [
    ['A1', 8.5, 18, 12.5, 4.4],
    ['A2', 11.0, 21, 12.1, 4.3],
  ].map(([id, ppm, r1, c1, c0]) => {
    const model = quartz(14.7456e6, ppm as number, r1 as number, (c1 as number) * fF, (c0 as number) * pF, 20 * pF);
    const lower = (id as string).toLowerCase();
    return {
      id: id as string,
      measured: '2026-02-24',
      by: 'AJ',
      instrument: INSTRUMENT.network,
      temperatureC: 24,
      model,
      modes: MAIN,
      sweeps: [
        {
          file: `${lower}-narrow.s1p`,
          fixture: 'reflection',
          format: ts2('RI', 'Hz'),
          grid: narrowAround(model),
          noiseDb: -72,
          driveW: 20 * uW,
        },
        {
          file: `${lower}-wide.s1p`,
          fixture: 'impedance',
          parameter: 'Z',
          format: ts2('MA', 'Hz'),
          grid: wideGrid(model),
          noiseDb: -72,
          driveW: 20 * uW,
        },
      ],
    };
  });
  parts.push({
    id: 'xt-14m7456-hc49s',
    title: '14.7456 MHz crystal, HC-49/S, 20 pF',
    kind: 'quartz-at',
    package: 'HC-49/S',
    supplier: 'Brimwell Quartzworks',
    supplierPart: 'BQW-4S-14M74-A',
    notes:
      'Baud-rate clock of the serial multiplexer (divides exactly to the usual UART rates). Two samples, Touchstone 2 one-port files.',
    datasheet: {
      frequency: '14.7456 MHz',
      tolerance: '30 ppm',
      stability: '30 ppm',
      loadCapacitance: '20 pF',
      esrMax: '40 ohm',
      c0Max: '7 pF',
      driveMax: '500 uW',
      overtone: 1,
      operatingRange: '-20 to 70 C',
    },
    scenario: { shows: 'Touchstone 2 one-port reflection (S) and impedance (Z) files' },
    samples,
  });
}

// 20. 32 MHz 2520: shunt-through narrow sweep, tab-separated R/X wide sweep.
{
  const model = quartz(32e6, -6, 30, 3.3 * fF, 1.35 * pF, 10 * pF);
  parts.push({
    id: 'xt-32m-2520',
    title: '32 MHz crystal, 2520 SMD, 10 pF',
    kind: 'quartz-at',
    package: '2520',
    supplier: 'Tavistrand Crystal',
    supplierPart: 'TVX25-32M-10',
    notes: 'Clock of the LoRa-class radio on the drifter buoys.',
    datasheet: {
      frequency: '32 MHz',
      tolerance: '10 ppm',
      stability: '20 ppm',
      loadCapacitance: '10 pF',
      esrMax: '50 ohm',
      c0Max: '2 pF',
      driveMax: '100 uW',
      overtone: 1,
      operatingRange: '-40 to 85 C',
    },
    scenario: { shows: 'shunt-through narrow sweep plus a tab-separated R/X wide sweep' },
    samples: [
      {
        id: 'A1',
        measured: '2026-05-26',
        by: 'TK',
        instrument: INSTRUMENT.network,
        model,
        modes: MAIN,
        sweeps: [
          {
            file: 'a1-narrow.s2p',
            fixture: 'shunt-thru',
            format: ts1('MA', 'Hz'),
            grid: narrowAround(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
          {
            file: 'a1-wide.tsv',
            fixture: 'impedance',
            format: csv('rx', '\t', 'kHz'),
            grid: wideGrid(model),
            noiseDb: -70,
            driveW: 10 * uW,
          },
        ],
      },
    ],
  });
}

/** Every demo part with its documented model values. */
export const DEMO_PARTS: readonly DemoPart[] = parts;

/** The model during one sweep: the sweep's own (temperature, drive) or the sample's reference model. */
export function modelOfSweep(sample: DemoSample, sweep: DemoSweep): BvdModel {
  return sweep.model ?? sample.model;
}
