/**
 * The team's oscillator circuits (`content/oscillators.yaml`) as a zod 4 schema.
 *
 * ```yaml
 * circuits:
 *   - name: sensor-hub-pierce          # letters, digits, '.', '_', '-'
 *     description: MCU main clock       # optional
 *     gm: 8 mA/V                        # amplifier transconductance (or "8 mS")
 *     inputCapacitance: 3 pF            # amplifier input pin to ground
 *     outputCapacitance: 4 pF           # amplifier output pin to ground
 *     boardStray: 1.5 pF                # trace/pad capacitance of EACH crystal pin to ground
 *     boardStrayUncertainty: 0.5 pF     # ± on each pin's board stray
 *     pinToPinStray: 0.3 pF             # optional, across the crystal (default 0)
 *     pinToPinStrayUncertainty: 0.1 pF  # optional (default 0)
 *     supply: 3.3 V
 *     swing: 2.5 V                      # optional: peak-to-peak across the crystal (default: supply)
 *     maxDrive: 100 uW                  # optional: the circuit's own drive budget
 *     capacitorTolerance: 5 %           # load capacitor tolerance ("5 %" or 0.05)
 *     series: E12                       # E6 | E12 | E24
 *     frequencyRange: 4 MHz to 50 MHz   # optional: parts this circuit is meant for
 *     frequencyRequirement: ±50 ppm     # optional: allowed deviation from nominal, all causes
 *     startupTimeMax: 2 ms              # optional: longest acceptable start-up time
 *     currentLimit: 200 uA              # optional: peak output current of the amplifier
 * ```
 * Quantities come out in SI base units under names that carry the unit (`gm` → `gmS`,
 * `boardStray` → `boardStrayF`, `supply` → `supplyV`, `capacitorTolerance` →
 * `capacitorToleranceFraction`, ...): one name per number from here to the page.
 *
 * Amplifier limiting: `currentLimit` is the most current the amplifier output delivers (its
 * bias current for a class-A stage). It is the one number that, with the small-signal network,
 * sets the steady amplitude when the circuit does not state its `swing` (osc/startup.ts,
 * describing-function estimate), and it is the number amplifier data sheets and simulations
 * give most directly. Without either, the swing is taken as the supply (an over-estimate).
 */
import { z } from 'zod';
import { parseQuantity, parseQuantityRange, type UnitKind } from '../units/si.ts';

/** Preferred-value series a circuit's load capacitors may come from (IEC 60063:2015). */
export type ESeriesName = 'E6' | 'E12' | 'E24';

/** The series names the record accepts; osc/e-series.ts holds their values. */
export const E_SERIES_NAMES: readonly ESeriesName[] = ['E6', 'E12', 'E24'];

/** A quantity string of the given kind, parsed to SI, with a sign rule. */
function quantity(kind: UnitKind, sign: 'positive' | 'non-negative') {
  return z.union([z.string(), z.number()]).transform((input, ctx) => {
    const parsed = parseQuantity(String(input), kind);
    if (!parsed.ok) {
      ctx.addIssue({ code: 'custom', message: parsed.message });
      return z.NEVER;
    }
    const good = sign === 'positive' ? parsed.value > 0 : parsed.value >= 0;
    if (!good) {
      const what = kind === 'capacitance' ? 'capacitance' : kind;
      ctx.addIssue({
        code: 'custom',
        message: `expected a ${sign === 'positive' ? 'positive' : 'non-negative'} ${what}, got "${input}"`,
      });
      return z.NEVER;
    }
    return parsed.value;
  });
}

/** Largest accepted capacitor tolerance (fraction). */
const MAX_TOLERANCE = 0.5;

/** "5 %", "5%", "0.05" or 0.05 → 0.05. */
const tolerance = z.union([z.string(), z.number()]).transform((input, ctx) => {
  const text = String(input).trim();
  // `\d+(?:\.\d*)?`, not `\d+\.?\d*`: the latter backtracks quadratically on a long run of digits
  const m = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(%?)$/.exec(text.replace(/^±\s*/, ''));
  const value = m ? Number(m[1]) / (m[2] ? 100 : 1) : Number.NaN;
  if (!(value >= 0 && value <= MAX_TOLERANCE)) {
    ctx.addIssue({ code: 'custom', message: `expected a tolerance between 0 and 50 % such as "5 %", got "${text}"` });
    return z.NEVER;
  }
  return value;
});

const frequencyRange = z.string().transform((input, ctx) => {
  const parsed = parseQuantityRange(input, 'frequency');
  if (!parsed.ok) {
    ctx.addIssue({ code: 'custom', message: parsed.message });
    return z.NEVER;
  }
  return { min: parsed.min, max: parsed.max };
});

const NAME = /^[A-Za-z0-9._-]+$/;

/** "±50 ppm", "50 ppm" or 50 → 50 (a positive number of ppm). */
const plusMinusPpm = z.union([z.string(), z.number()]).transform((input, ctx) => {
  const text = String(input)
    .trim()
    .replace(/^(±|\+\/-|\+-)\s*/, '');
  const parsed = parseQuantity(/ppm$/.test(text) ? text : `${text} ppm`, 'ppm');
  if (!parsed.ok || !(parsed.value > 0)) {
    ctx.addIssue({
      code: 'custom',
      message: `expected a positive frequency requirement such as "±50 ppm", got "${input}"`,
    });
    return z.NEVER;
  }
  return parsed.value;
});

/** The record's keys and values as written (before the unit-named output). */
export const OscillatorCircuitInput = z.object({
  /** Circuit name, unique in the file. */
  name: z
    .union([z.string(), z.number()])
    .transform((v) => String(v))
    .pipe(
      z
        .string()
        .min(1, 'expected a circuit name')
        .max(64, 'expected a circuit name of at most 64 characters')
        .regex(NAME, "expected a circuit name of letters, digits, '.', '_' or '-'"),
    ),
  /** Free text. */
  description: z
    .union([z.string(), z.number()])
    .transform((v) => String(v))
    .pipe(z.string().max(500, 'expected at most 500 characters'))
    .optional(),
  /** Amplifier small-signal transconductance, S. */
  gm: quantity('conductance', 'positive'),
  /** Amplifier input pin to ground, F. */
  inputCapacitance: quantity('capacitance', 'non-negative'),
  /** Amplifier output pin to ground, F. */
  outputCapacitance: quantity('capacitance', 'non-negative'),
  /** Board trace/pad capacitance of each crystal pin to ground, F. */
  boardStray: quantity('capacitance', 'non-negative'),
  /** ± uncertainty of each pin's board stray, F. */
  boardStrayUncertainty: quantity('capacitance', 'non-negative').default(0),
  /** Capacitance across the crystal pins, F. */
  pinToPinStray: quantity('capacitance', 'non-negative').default(0),
  /** ± uncertainty of the pin-to-pin stray, F. */
  pinToPinStrayUncertainty: quantity('capacitance', 'non-negative').default(0),
  /** Supply voltage, V. */
  supply: quantity('voltage', 'positive'),
  /** Peak-to-peak voltage across the crystal, V (default: the supply). */
  swing: quantity('voltage', 'positive').optional(),
  /** The circuit's own drive budget, W. */
  maxDrive: quantity('power', 'positive').optional(),
  /** Load capacitor tolerance, fraction (0.05 = 5 %). */
  capacitorTolerance: tolerance,
  /** Preferred-value series of the load capacitors. */
  series: z.enum(E_SERIES_NAMES as unknown as [ESeriesName, ...ESeriesName[]], {
    message: `expected one of ${E_SERIES_NAMES.join(', ')}`,
  }),
  /** Parts this circuit is meant for, Hz. */
  frequencyRange: frequencyRange.optional(),
  /** Allowed frequency deviation from nominal over every cause (±), ppm. */
  frequencyRequirement: plusMinusPpm.optional(),
  /** Longest acceptable start-up time, s. */
  startupTimeMax: quantity('time', 'positive').optional(),
  /** Peak output current of the amplifier (limiting), A. */
  currentLimit: quantity('current', 'positive').optional(),
});

/** One circuit in SI units under names that carry the unit. */
export interface OscillatorCircuit {
  name: string;
  description?: string;
  /** Amplifier small-signal transconductance, S. */
  gmS: number;
  /** Amplifier input pin to ground, F. */
  inputCapacitanceF: number;
  /** Amplifier output pin to ground, F. */
  outputCapacitanceF: number;
  /** Board stray of each crystal pin to ground, F. */
  boardStrayF: number;
  /** ± on each pin's board stray, F. */
  boardStrayUncertaintyF: number;
  /** Capacitance across the crystal pins, F. */
  pinToPinStrayF: number;
  /** ± on the pin-to-pin stray, F. */
  pinToPinStrayUncertaintyF: number;
  /** Supply voltage, V. */
  supplyV: number;
  /** Peak-to-peak voltage across the crystal, V. */
  swingVpp?: number;
  /** The circuit's own drive budget, W. */
  maxDriveW?: number;
  /** Load capacitor tolerance as a fraction (0.05 = 5 %). */
  capacitorToleranceFraction: number;
  series: ESeriesName;
  /** Parts this circuit is meant for, Hz. */
  frequencyRangeHz?: { min: number; max: number };
  /** Allowed deviation from nominal (±), ppm. */
  frequencyRequirementPpm?: number;
  /** Longest acceptable start-up time, s. */
  startupTimeMaxS?: number;
  /** Peak output current of the amplifier, A. */
  currentLimitA?: number;
}

/** Output name of each record key. */
export const CIRCUIT_OUTPUT_NAME = {
  name: 'name',
  description: 'description',
  gm: 'gmS',
  inputCapacitance: 'inputCapacitanceF',
  outputCapacitance: 'outputCapacitanceF',
  boardStray: 'boardStrayF',
  boardStrayUncertainty: 'boardStrayUncertaintyF',
  pinToPinStray: 'pinToPinStrayF',
  pinToPinStrayUncertainty: 'pinToPinStrayUncertaintyF',
  supply: 'supplyV',
  swing: 'swingVpp',
  maxDrive: 'maxDriveW',
  capacitorTolerance: 'capacitorToleranceFraction',
  series: 'series',
  frequencyRange: 'frequencyRangeHz',
  frequencyRequirement: 'frequencyRequirementPpm',
  startupTimeMax: 'startupTimeMaxS',
  currentLimit: 'currentLimitA',
} as const satisfies { [K in keyof z.input<typeof OscillatorCircuitInput>]-?: keyof OscillatorCircuit };

export type CircuitRecordKey = keyof typeof CIRCUIT_OUTPUT_NAME;

export const OscillatorCircuitSchema = OscillatorCircuitInput.transform((c): OscillatorCircuit => ({
  name: c.name,
  description: c.description,
  gmS: c.gm,
  inputCapacitanceF: c.inputCapacitance,
  outputCapacitanceF: c.outputCapacitance,
  boardStrayF: c.boardStray,
  boardStrayUncertaintyF: c.boardStrayUncertainty,
  pinToPinStrayF: c.pinToPinStray,
  pinToPinStrayUncertaintyF: c.pinToPinStrayUncertainty,
  supplyV: c.supply,
  swingVpp: c.swing,
  maxDriveW: c.maxDrive,
  capacitorToleranceFraction: c.capacitorTolerance,
  series: c.series,
  frequencyRangeHz: c.frequencyRange,
  frequencyRequirementPpm: c.frequencyRequirement,
  startupTimeMaxS: c.startupTimeMax,
  currentLimitA: c.currentLimit,
}));

export const OscillatorsFileSchema = z.object({
  circuits: z.array(z.unknown()).min(1, 'expected at least one circuit'),
});

/** Keys a circuit may have, for unknown-key warnings. */
export const CIRCUIT_KEYS = Object.keys(OscillatorCircuitInput.shape);
