/**
 * The part record (`part.yaml`, README: The part record) as a zod 4 schema.
 *
 * Input keys are exactly the record's keys. Quantities are written as strings with units in the
 * record (`12 MHz`) and come out of the schema as numbers in SI base units under names that carry
 * the unit (`frequency: 12 MHz` → `frequencyHz: 12e6`; Hz, F, Ω, W, °C, ppm): one name per number
 * from here to the page. Types are derived from the schema's output.
 */
import { z } from 'zod';
import { parseQuantity, parseQuantityRange, type UnitKind } from '../units/si.ts';

/** A quantity string of the given kind, parsed to its SI value. */
function quantity(kind: UnitKind, opts: { positive?: boolean } = {}) {
  return z.union([z.string(), z.number()]).transform((input, ctx) => {
    const parsed = parseQuantity(String(input), kind);
    if (!parsed.ok) {
      ctx.addIssue({ code: 'custom', message: parsed.message });
      return z.NEVER;
    }
    if (opts.positive && !(parsed.value > 0)) {
      ctx.addIssue({ code: 'custom', message: `expected a positive value, got "${input}"` });
      return z.NEVER;
    }
    return parsed.value;
  });
}

function temperatureRange() {
  return z.string().transform((input, ctx) => {
    const parsed = parseQuantityRange(input, 'temperature');
    if (!parsed.ok) {
      ctx.addIssue({ code: 'custom', message: parsed.message });
      return z.NEVER;
    }
    return { min: parsed.min, max: parsed.max };
  });
}

/** Letters, digits, '.', '_', '-' (README: The part record). */
const ID = /^[A-Za-z0-9._-]+$/;
const idString = (what: string) =>
  z
    .union([z.string(), z.number()])
    .transform((v) => String(v))
    .pipe(
      z
        .string()
        .min(1, `expected a non-empty ${what}`)
        .max(64, `expected a ${what} of at most 64 characters`)
        .regex(ID, `expected a ${what} of letters, digits, '.', '_' or '-'`),
    );

/** A file name relative to the part folder; path safety is checked when the file is opened. */
const fileName = z.string().min(1, 'expected a file name').max(255, 'expected a file name of at most 255 characters');

export const PART_KINDS = ['quartz-at', 'quartz-tuning-fork', 'ceramic', 'saw', 'other'] as const;
export const FIXTURES = ['reflection', 'series-thru', 'shunt-thru', 'impedance'] as const;

const freeText = (max: number) =>
  z
    .union([z.string(), z.number()])
    .transform((v) => String(v))
    .pipe(z.string().max(max, `expected at most ${max} characters`));

const DatasheetInput = z.object({
  /** Nominal frequency, Hz. */
  frequency: quantity('frequency', { positive: true }).optional(),
  /** Frequency tolerance at 25 °C and the stated load capacitance, ppm. */
  tolerance: quantity('ppm').optional(),
  /** Frequency stability over the operating range, ppm. */
  stability: quantity('ppm').optional(),
  /** Load capacitance, F, or 'series' for series-resonant calibration. */
  loadCapacitance: z.union([z.literal('series'), quantity('capacitance', { positive: true })]).optional(),
  /** Maximum ESR, Ω. */
  esrMax: quantity('resistance', { positive: true }).optional(),
  /** Maximum shunt capacitance, F. */
  c0Max: quantity('capacitance', { positive: true }).optional(),
  /** Maximum drive level, W. */
  driveMax: quantity('power', { positive: true }).optional(),
  /** Intended overtone order: 1 fundamental, 3, 5, ... */
  overtone: z
    .number()
    .int('expected an odd whole number (1, 3, 5, ...)')
    .positive()
    .refine((n) => n % 2 === 1, 'expected an odd overtone order (1, 3, 5, ...)')
    .optional(),
  /** Operating temperature range, °C. */
  operatingRange: temperatureRange().optional(),
});

/** Datasheet promises in SI units, names carrying the unit. */
export interface Datasheet {
  frequencyHz?: number;
  tolerancePpm?: number;
  stabilityPpm?: number;
  loadCapacitanceF?: number | 'series';
  esrMaxOhm?: number;
  c0MaxF?: number;
  driveMaxW?: number;
  overtone?: number;
  operatingRangeC?: { min: number; max: number };
}

export const DatasheetSchema = DatasheetInput.transform((d): Datasheet => ({
  frequencyHz: d.frequency,
  tolerancePpm: d.tolerance,
  stabilityPpm: d.stability,
  loadCapacitanceF: d.loadCapacitance,
  esrMaxOhm: d.esrMax,
  c0MaxF: d.c0Max,
  driveMaxW: d.driveMax,
  overtone: d.overtone,
  operatingRangeC: d.operatingRange,
}));

/** What a CSV/TSV sweep's columns can hold: the keys of a sweep's `columns:` map (README: The part record). */
export const SWEEP_COLUMN_ROLES = ['frequency', 'resistance', 'reactance', 'magnitude', 'phase'] as const;
export type SweepColumnRole = (typeof SWEEP_COLUMN_ROLES)[number];

const COLUMN_REF_MESSAGE = 'expected a column name as written in the header, or its number (1 = first column)';
const columnRef = z.union(
  [
    z.string().min(1, COLUMN_REF_MESSAGE).max(200, 'expected a column name of at most 200 characters'),
    z.number().int(COLUMN_REF_MESSAGE).positive(COLUMN_REF_MESSAGE),
  ],
  {
    message: COLUMN_REF_MESSAGE,
  },
);
/** Which column of a CSV/TSV file holds what, where the names do not say (README: The part record). */
const ColumnMapInput = z.record(z.string(), columnRef).superRefine((map, ctx) => {
  for (const key of Object.keys(map)) {
    if (!(SWEEP_COLUMN_ROLES as readonly string[]).includes(key)) {
      ctx.addIssue({
        code: 'custom',
        path: [key],
        message: `unknown column "${key.slice(0, 40)}"; expected ${SWEEP_COLUMN_ROLES.join(', ')}`,
      });
    }
  }
  const rx = 'resistance' in map || 'reactance' in map;
  const mp = 'magnitude' in map || 'phase' in map;
  if (rx && mp)
    ctx.addIssue({ code: 'custom', message: 'expected resistance and reactance, or magnitude and phase, not both' });
});

const SweepRefInput = z
  .object({
    file: fileName,
    fixture: z.enum(FIXTURES, { message: `expected one of ${FIXTURES.join(', ')}` }),
    /** Reference impedance, Ω (Touchstone files carry their own). */
    referenceImpedance: quantity('resistance', { positive: true }).optional(),
    /** A known capacitor added during this sweep, F. */
    addedCapacitance: quantity('capacitance', { positive: true }).optional(),
    addedConnection: z.enum(['parallel', 'series'], { message: 'expected parallel or series' }).optional(),
    /** Temperature during this sweep, °C (overrides the sample's). */
    temperature: quantity('temperature').optional(),
    /** Drive level during this sweep, W. */
    drive: quantity('power', { positive: true }).optional(),
    /** CSV/TSV only: the 1-based line of the header row, where the reader does not find it. */
    headerLine: z
      .number({ message: 'expected a line number (1 = first line)' })
      .int('expected a whole line number')
      .positive('expected a line number (1 = first line)')
      .optional(),
    /** CSV/TSV only: which column holds what, where the names do not say. */
    columns: ColumnMapInput.optional(),
  })
  .superRefine((sweep, ctx) => {
    if (sweep.addedConnection && sweep.addedCapacitance === undefined) {
      ctx.addIssue({ code: 'custom', path: ['addedConnection'], message: 'addedConnection needs addedCapacitance' });
    }
    const csv = /\.(csv|tsv)$/i.test(sweep.file);
    for (const key of ['headerLine', 'columns'] as const) {
      if (sweep[key] !== undefined && !csv)
        ctx.addIssue({
          code: 'custom',
          path: [key],
          message: `${key} applies to CSV/TSV files only, got "${sweep.file.slice(0, 80)}"`,
        });
    }
  });

/** One sweep of a sample, quantities in SI units under unit-carrying names. */
export interface SweepRef {
  file: string;
  fixture: Fixture;
  referenceImpedanceOhm?: number;
  addedCapacitanceF?: number;
  addedConnection?: 'parallel' | 'series';
  temperatureC?: number;
  driveW?: number;
  /** CSV/TSV only: 1-based line of the header row. */
  headerLine?: number;
  /** CSV/TSV only: column name as written, or number (1 = first), per role. */
  columns?: Partial<Record<SweepColumnRole, string | number>>;
}

export const SweepRefSchema = SweepRefInput.transform((s): SweepRef => ({
  file: s.file,
  fixture: s.fixture,
  referenceImpedanceOhm: s.referenceImpedance,
  addedCapacitanceF: s.addedCapacitance,
  addedConnection: s.addedConnection,
  temperatureC: s.temperature,
  driveW: s.drive,
  ...(s.headerLine !== undefined ? { headerLine: s.headerLine } : {}),
  ...(s.columns !== undefined ? { columns: s.columns as Partial<Record<SweepColumnRole, string | number>> } : {}),
}));

const CompensationInput = z
  .object({
    open: fileName.optional(),
    short: fileName.optional(),
    /** Optional load standard sweep and its true impedance (open/short/load correction). */
    load: fileName.optional(),
    loadResistance: quantity('resistance', { positive: true }).optional(),
    /** Fixture of the compensation sweeps; defaults to the first sweep's fixture. Only sweeps taken in this fixture are compensated. */
    fixture: z.enum(FIXTURES, { message: `expected one of ${FIXTURES.join(', ')}` }).optional(),
  })
  .superRefine((c, ctx) => {
    if ((c.open === undefined) !== (c.short === undefined)) {
      ctx.addIssue({
        code: 'custom',
        path: [c.open === undefined ? 'open' : 'short'],
        message: 'open and short compensation sweeps go together',
      });
    }
    if (c.load !== undefined && c.loadResistance === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['loadResistance'],
        message: 'a load sweep needs loadResistance, e.g. "50 ohm"',
      });
    }
  });

/** Open/short(/load) compensation sweeps of a sample. */
export interface Compensation {
  open?: string;
  short?: string;
  load?: string;
  loadResistanceOhm?: number;
  fixture?: Fixture;
}

export const CompensationSchema = CompensationInput.transform((c): Compensation => ({
  open: c.open,
  short: c.short,
  load: c.load,
  loadResistanceOhm: c.loadResistance,
  fixture: c.fixture,
}));

const isoDate = z.union([z.string(), z.date()]).transform((v, ctx) => {
  const text = v instanceof Date ? v.toISOString().slice(0, 10) : v;
  // Date.parse rolls 2026-02-30 over to March: require the date to survive a round trip.
  const roundTrip = Number.isNaN(Date.parse(text)) ? '' : new Date(`${text}T00:00:00Z`).toISOString().slice(0, 10);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(text) || roundTrip !== text) {
    ctx.addIssue({ code: 'custom', message: `expected an ISO date such as 2026-05-02, got "${text}"` });
    return z.NEVER;
  }
  return text;
});

const SampleInput = z.object({
  id: idString('sample id'),
  lot: freeText(200).optional(),
  measured: isoDate.optional(),
  by: freeText(200).optional(),
  instrument: freeText(200).optional(),
  /** Above this frequency the instrument's data are flagged, not trusted, Hz. */
  instrumentMaxFrequency: quantity('frequency', { positive: true }).optional(),
  /** Default temperature of this sample's sweeps, °C. */
  temperature: quantity('temperature').optional(),
  compensation: CompensationSchema.optional(),
  sweeps: z.array(SweepRefSchema).min(1, 'expected at least one sweep'),
});

/** One measured sample: its conditions and sweeps. */
export interface Sample {
  id: string;
  lot?: string;
  measured?: string;
  by?: string;
  instrument?: string;
  instrumentMaxFrequencyHz?: number;
  temperatureC?: number;
  compensation?: Compensation;
  sweeps: SweepRef[];
}

export const SampleSchema = SampleInput.transform((s): Sample => ({
  id: s.id,
  lot: s.lot,
  measured: s.measured,
  by: s.by,
  instrument: s.instrument,
  instrumentMaxFrequencyHz: s.instrumentMaxFrequency,
  temperatureC: s.temperature,
  compensation: s.compensation,
  sweeps: s.sweeps,
}));

export const PartSchema = z
  .object({
    id: idString('part id'),
    title: freeText(200).pipe(z.string().min(1, 'expected a title')),
    kind: z.enum(PART_KINDS, { message: `expected one of ${PART_KINDS.join(', ')}` }),
    package: freeText(100).optional(),
    supplier: freeText(200).optional(),
    supplierPart: freeText(200).optional(),
    notes: freeText(20_000).optional(),
    /** Free text; the demo marks its records `synthetic: true`. */
    synthetic: z.boolean().optional(),
    datasheet: DatasheetSchema.optional(),
    samples: z.array(SampleSchema).min(1, 'expected at least one sample'),
  })
  .superRefine((part, ctx) => {
    const seen = new Map<string, number>();
    part.samples.forEach((s, i) => {
      if (seen.has(s.id))
        ctx.addIssue({
          code: 'custom',
          path: ['samples', i, 'id'],
          message: `duplicate sample id "${s.id}" (also samples[${seen.get(s.id)}])`,
        });
      else seen.set(s.id, i);
    });
  });

export type Part = z.output<typeof PartSchema>;
export type PartKind = (typeof PART_KINDS)[number];
export type Fixture = (typeof FIXTURES)[number];

/** Keys the schema knows, per object level, for unknown-key warnings. */
export const KNOWN_KEYS = {
  part: ['id', 'title', 'kind', 'package', 'supplier', 'supplierPart', 'notes', 'synthetic', 'datasheet', 'samples'],
  datasheet: Object.keys(DatasheetInput.shape),
  sample: Object.keys(SampleInput.shape),
  sweep: Object.keys(SweepRefInput.shape),
  compensation: Object.keys(CompensationInput.shape),
} as const;
