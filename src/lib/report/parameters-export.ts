/**
 * Extracted parameters for download: JSON (SI base units, unit-suffixed keys) and CSV (one row
 * per mode, header with units in parentheses, C0 repeated on every row). Numbers keep 15
 * significant digits; missing values are empty CSV cells and absent JSON keys, never NaN.
 */
import type { ModeResult, SampleResult } from '../extract/types.ts';

/** What the export needs of a sample (SampleResult satisfies it; a lot median can too). */
export interface ExportSample {
  sample: string;
  c0F: number;
  modes: Array<Pick<ModeResult, 'overtone' | 'spurious' | 'fsHz' | 'r1Ohm' | 'l1H' | 'c1F' | 'q'> & Partial<Pick<ModeResult, 'fpHz' | 'frHz' | 'faHz' | 'rrOhm' | 'm' | 'r' | 'uncertainty'>>>;
  temperatureC?: number;
  driveW?: number;
}

export interface ExportInfo {
  partId: string;
  /** Measurement date (ISO), passed in. */
  date?: string;
}

/** CSV columns: header text and how to read the value. */
const COLUMNS: Array<[string, (m: ExportSample['modes'][number], s: ExportSample) => number | string | boolean | undefined]> = [
  ['mode', () => undefined],
  ['overtone', (m) => m.overtone],
  ['spurious', (m) => m.spurious],
  ['fs (Hz)', (m) => m.fsHz],
  ['fp (Hz)', (m) => m.fpHz],
  ['fr (Hz)', (m) => m.frHz],
  ['fa (Hz)', (m) => m.faHz],
  ['R1 (ohm)', (m) => m.r1Ohm],
  ['Rr (ohm)', (m) => m.rrOhm],
  ['L1 (H)', (m) => m.l1H],
  ['C1 (F)', (m) => m.c1F],
  ['C0 (F)', (_m, s) => s.c0F],
  ['Q', (m) => m.q],
  ['r = C0/C1', (m) => m.r],
  ['M = Q/r', (m) => m.m],
  ['u(fs) (Hz)', (m) => m.uncertainty?.fsHz],
  ['u(R1) (ohm)', (m) => m.uncertainty?.r1Ohm],
  ['u(L1) (H)', (m) => m.uncertainty?.l1H],
  ['u(C1) (F)', (m) => m.uncertainty?.c1F],
  ['u(C0) (F)', (m) => m.uncertainty?.c0F],
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
