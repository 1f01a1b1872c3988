/**
 * Extracted parameters for download: JSON (SI base units, unit-suffixed keys) and CSV (one row
 * per mode, header with units in parentheses, C0 repeated on every row). JSON numbers keep full
 * precision; in the CSV a value with an uncertainty column is rounded with it by the GUM rule
 * (src/lib/units/measured.ts), other numbers keep 15 significant digits. Missing values are
 * empty CSV cells and absent JSON keys, never NaN.
 */
import type { ModeResult, SampleResult } from '../extract/types.ts';
import { measuredCells } from '../units/measured.ts';

/** What the export needs of a sample (SampleResult satisfies it; a lot median can too). */
export interface ExportSample {
  sample: string;
  c0F: number;
  modes: Array<
    Pick<ModeResult, 'overtone' | 'spurious' | 'fsHz' | 'r1Ohm' | 'l1H' | 'c1F' | 'q'> &
      Partial<Pick<ModeResult, 'fpHz' | 'frHz' | 'faHz' | 'rrOhm' | 'm' | 'r' | 'uncertainty'>>
  >;
  temperatureC?: number;
  driveW?: number;
}

export interface ExportInfo {
  partId: string;
  /** Measurement date (ISO), passed in. */
  date?: string;
}

type Mode = ExportSample['modes'][number];

/** The CSV cells of a value and its uncertainty, rounded together; undefined when the value is absent. */
function pair(v: number | undefined, u: number | undefined): [string, string] | undefined {
  return v === undefined || !Number.isFinite(v) ? undefined : measuredCells(v, u);
}

/** CSV columns: header text and how to read the value. */
const COLUMNS: Array<[string, (m: Mode, s: ExportSample) => number | string | boolean | undefined]> = [
  ['mode', () => undefined],
  ['overtone', (m) => m.overtone],
  ['spurious', (m) => m.spurious],
  ['fs (Hz)', (m) => pair(m.fsHz, m.uncertainty?.fsHz)?.[0]],
  ['fp (Hz)', (m) => m.fpHz],
  ['fr (Hz)', (m) => m.frHz],
  ['fa (Hz)', (m) => m.faHz],
  ['R1 (ohm)', (m) => pair(m.r1Ohm, m.uncertainty?.r1Ohm)?.[0]],
  ['Rr (ohm)', (m) => m.rrOhm],
  ['L1 (H)', (m) => pair(m.l1H, m.uncertainty?.l1H)?.[0]],
  ['C1 (F)', (m) => pair(m.c1F, m.uncertainty?.c1F)?.[0]],
  ['C0 (F)', (m, s) => pair(s.c0F, m.uncertainty?.c0F)?.[0]],
  ['Q', (m) => m.q],
  ['r = C0/C1', (m) => m.r],
  ['M = Q/r', (m) => m.m],
  ['u(fs) (Hz)', (m) => (m.uncertainty?.fsHz === undefined ? undefined : pair(m.fsHz, m.uncertainty.fsHz)?.[1])],
  ['u(R1) (ohm)', (m) => (m.uncertainty?.r1Ohm === undefined ? undefined : pair(m.r1Ohm, m.uncertainty.r1Ohm)?.[1])],
  ['u(L1) (H)', (m) => (m.uncertainty?.l1H === undefined ? undefined : pair(m.l1H, m.uncertainty.l1H)?.[1])],
  ['u(C1) (F)', (m) => (m.uncertainty?.c1F === undefined ? undefined : pair(m.c1F, m.uncertainty.c1F)?.[1])],
  ['u(C0) (F)', (m, s) => (m.uncertainty?.c0F === undefined ? undefined : pair(s.c0F, m.uncertainty.c0F)?.[1])],
  ['temperature (C)', (_m, s) => s.temperatureC],
  ['drive (W)', (_m, s) => s.driveW],
];

function cell(v: number | string | boolean | undefined): string {
  if (v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(Number(v.toPrecision(15))) : '';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  return /[",\n\r]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/** Parameters as CSV: header row with units, then one row per mode. */
export function formatParametersCsv(sample: ExportSample): string {
  const rows = [COLUMNS.map(([h]) => cell(h)).join(',')];
  sample.modes.forEach((m, i) => {
    rows.push(COLUMNS.map(([h, get]) => (h === 'mode' ? String(i + 1) : cell(get(m, sample)))).join(','));
  });
  return `${rows.join('\n')}\n`;
}

function finite(v: number | undefined): number | undefined {
  return v !== undefined && Number.isFinite(v) ? v : undefined;
}

/** Parameters as JSON text (two-space indent): part, sample, conditions, C0 and the modes. */
export function formatParametersJson(sample: ExportSample | SampleResult, info: ExportInfo): string {
  const out = {
    part: info.partId,
    sample: sample.sample,
    measured: info.date,
    temperatureC: finite(sample.temperatureC),
    driveW: finite(sample.driveW),
    units: 'SI base units: Hz, ohm, H, F; q, r, m dimensionless',
    c0F: finite(sample.c0F),
    modes: sample.modes.map((m) => ({
      overtone: m.overtone,
      spurious: m.spurious,
      fsHz: finite(m.fsHz),
      fpHz: finite(m.fpHz),
      frHz: finite(m.frHz),
      faHz: finite(m.faHz),
      r1Ohm: finite(m.r1Ohm),
      rrOhm: finite(m.rrOhm),
      l1H: finite(m.l1H),
      c1F: finite(m.c1F),
      q: finite(m.q),
      r: finite(m.r),
      m: finite(m.m),
      uncertainty: m.uncertainty
        ? Object.fromEntries(Object.entries(m.uncertainty).filter(([, v]) => Number.isFinite(v)))
        : undefined,
    })),
  };
  return `${JSON.stringify(out, null, 2)}\n`;
}
