/**
 * SPICE subcircuit of a measured part: C0 between the two pins and one series R-L-C branch per
 * mode (IEEE Std 177 / IEC 60444-5 multi-resonance equivalent circuit).
 *
 * - Plain R, L, C elements any SPICE reads; values in plain exponent form with 15 significant
 *   digits by default (1.00000000000000e-14) — never SPICE suffixes, where M means milli.
 * - Comment lines are made safe: user text (titles with newlines, control characters, non-ASCII)
 *   cannot leave its `*` line; the subcircuit name is reduced to [A-Za-z0-9_].
 * - The header says what the model is: part, sample, conditions, date, how it was extracted,
 *   that it is measured data, that it is narrow-band and linear, its valid span and the cautions
 *   of README: Cautions. The date is passed in (the sample's measurement date), never read from a clock.
 * - The writer returns a string and never writes a file.
 */
import { inductanceOf, qualityOf, type BvdModel } from './bvd.ts';

/** What a branch is, for selection and comments. */
export interface BranchLabel {
  /** Physical overtone order (spurious: the nearest main mode's order). */
  overtone: number;
  spurious: boolean;
  /** True for the part's main (wanted) mode. */
  main?: boolean;
}

/** Descriptive facts for the header. All optional except the part id. */
export interface NetlistInfo {
  partId: string;
  title?: string;
  kind?: string;
  /** Sample id (one physical unit). */
  sample?: string;
  /** For a lot-median model: how many samples went into it. */
  lotMedianOf?: number;
  /** Measurement temperature, °C. */
  temperatureC?: number;
  /** Drive level of the measurement, W. */
  driveW?: number;
  /** Date of the measurement / extraction, ISO (passed in, no clock). */
  date?: string;
  /** How the parameters were obtained, e.g. "complex least squares (complex-fit)". */
  method?: string;
  /** RMS relative residual of the fit. */
  fitResidual?: number;
  /** Frequency span the model rests on, Hz. */
  validSpanHz?: { min: number; max: number };
  /** One label per model branch (same order). */
  labels?: BranchLabel[];
  /** Subcircuit name; default from part and sample. */
  subcktName?: string;
}

export interface FormatNetlistOptions {
  /** Only the main mode's branch (the branch labelled `main`; a lone branch needs no label). Default false. */
  mainModeOnly?: boolean;
  /** Keep branches labelled spurious. Default true. */
  includeSpurious?: boolean;
  /** Significant digits of element values; default {@link NETLIST_DIGITS}, at least 12 recommended. */
  digits?: number;
}

/** Default significant digits of element values. */
export const NETLIST_DIGITS = 15;
/** Longest comment text kept per line. */
const MAX_COMMENT_CHARS = 200;

/**
 * Make user text safe for a one-line comment (SPICE `*` or Touchstone `!`): line breaks and
 * control characters become spaces, common symbols are spelled in ASCII, backslashes become '/'
 * (no reader can take one for a line continuation), other non-ASCII characters become '?', runs
 * of spaces collapse, and the text is cut to 200 characters.
 */
export function sanitizeCommentText(text: string): string {
  const ascii = String(text)
    .replace(/[µμ]/g, 'u')
    .replace(/[\u03a9\u2126]/g, 'ohm')
    .replace(/ω/g, 'w')
    .replace(/°/g, 'deg')
    .replace(/±/g, '+/-')
    .replace(/\\/g, '/')
    .replace(/[–—]/g, '-')
    .replace(/…/g, '...')
    .replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, ' ')
    .replace(/[^\x20-\x7e]/g, '?')
    .replace(/\s+/g, ' ')
    .trim();
  return ascii.length > MAX_COMMENT_CHARS ? `${ascii.slice(0, MAX_COMMENT_CHARS - 3)}...` : ascii;
}

/** A subcircuit name of [A-Za-z0-9_] starting with a letter (at most 64 characters). */
export function sanitizeSubcktName(name: string): string {
  let s = String(name)
    .replace(/[^A-Za-z0-9_]/g, '_')
    .replace(/_+/g, '_')
    .replace(/^_|_$/g, '');
  if (!/^[A-Za-z]/.test(s)) s = `X${s}`;
  return s.slice(0, 64);
}

/** A value in plain exponent form with `digits` significant digits: 1.00000000000000e-14. */
export function formatSpiceNumber(value: number, digits = NETLIST_DIGITS): string {
  return value.toExponential(Math.max(0, digits - 1));
}

function g(x: number, digits = 12): string {
  return Number(x.toPrecision(digits)).toString();
}

/** Indices of the branches to write, after the selection options. */
function selectBranches(model: BvdModel, labels: BranchLabel[] | undefined, options: FormatNetlistOptions): number[] {
  const all = model.branches.map((_, i) => i);
  const keepSpurious = options.includeSpurious ?? true;
  let chosen = all.filter((i) => keepSpurious || !labels?.[i]?.spurious);
  if (options.mainModeOnly) {
    // The main mode is decided once, by the extraction (SampleResult.mainMode): the labels carry it.
    const main = labels ? labels.findIndex((l) => l.main) : model.branches.length === 1 ? 0 : -1;
    if (main < 0 && model.branches.length > 0) {
      throw new Error(
        `formatNetlist: main mode only, but no branch of ${model.branches.length} is labelled main (label the branch of SampleResult.mainMode)`,
      );
    }
    chosen = main >= 0 ? [main] : [];
  }
  return chosen;
}

/** Write the subcircuit (see module doc). */
export function formatNetlist(model: BvdModel, info: NetlistInfo, options: FormatNetlistOptions = {}): string {
  const digits = options.digits ?? NETLIST_DIGITS;
  const num = (v: number) => formatSpiceNumber(v, digits);
  const c = (text: string) => `* ${sanitizeCommentText(text)}`;
  const name = sanitizeSubcktName(
    info.subcktName ?? `${info.partId}${info.sample ? `_${info.sample}` : ''}${info.lotMedianOf ? '_median' : ''}`,
  );
  const chosen = selectBranches(model, info.labels, options);
  const dropped = model.branches.length - chosen.length;

  const lines: string[] = [];
  lines.push(
    c(
      `Motional BVD model of ${info.partId}${info.title ? ` - ${info.title}` : ''}${info.kind ? ` (${info.kind})` : ''}`,
    ),
  );
  if (info.lotMedianOf)
    lines.push(
      c(`lot median part: median of each parameter per mode over ${info.lotMedianOf} samples (not one physical unit)`),
    );
  else if (info.sample) lines.push(c(`sample: ${info.sample}`));
  const cond: string[] = [];
  if (info.temperatureC !== undefined) cond.push(`temperature ${g(info.temperatureC, 4)} C`);
  if (info.driveW !== undefined) cond.push(`drive ${g(info.driveW * 1e6, 4)} uW`);
  lines.push(c(`conditions: ${cond.length ? cond.join(', ') : 'not recorded'}`));
  lines.push(c(`measured: ${info.date ?? 'date not recorded'}`));
  const how = [info.method ? `extracted by ${info.method}` : 'extracted from measured sweeps'];
  if (info.fitResidual !== undefined && Number.isFinite(info.fitResidual))
    how.push(`rms relative fit residual ${g(info.fitResidual, 3)}`);
  lines.push(c(how.join(', ')));
  lines.push(
    c(
      info.lotMedianOf
        ? `DERIVED FROM MEASURED DATA of ${info.lotMedianOf} samples, each at one drive level, temperature and fixture: not a specification,`
        : 'MEASURED DATA of one sample at one drive level, temperature and fixture: not a specification,',
    ),
  );
  lines.push(c("  not a substitute for the maker's data or qualification of the part."));
  lines.push(
    c(
      'narrow-band linear model: valid only near each listed mode' +
        (info.validSpanHz
          ? ` within the measured span ${g(info.validSpanHz.min)} Hz to ${g(info.validSpanHz.max)} Hz`
          : '') +
        ';',
    ),
  );
  lines.push(
    c('  no drive-level dependence, temperature, aging or amplitude effects; unlisted spurious modes absent.'),
  );
  if (dropped > 0)
    lines.push(
      c(
        `${dropped} measured mode${dropped > 1 ? 's' : ''} left out (${options.mainModeOnly ? 'main mode only' : 'spurious modes excluded'})`,
      ),
    );
  for (const w of plausibilityWarnings(model, chosen, info)) lines.push(c(`CAUTION: ${w}`));
  lines.push(c('pins 1 2; C0 between the pins, one series R-L-C branch per mode; values in F, H, ohm'));
  lines.push(c(`usage: X1 a b ${name}`));
  lines.push(`.subckt ${name} 1 2`);
  lines.push(`C0 1 2 ${num(model.c0F)}`);
  chosen.forEach((bi, k) => {
    const br = model.branches[bi];
    const label = info.labels?.[bi];
    const n = k + 1;
    const what = label
      ? `${label.spurious ? 'spurious mode near overtone' : 'overtone'} ${label.overtone}${label.main ? ', main mode' : ''}`
      : `mode ${n}`;
    lines.push(c(`branch ${n}: ${what}; fs ${g(br.fsHz)} Hz, Q ${g(qualityOf(br), 6)}`));
    lines.push(`R${n} 1 b${n}a ${num(br.r1Ohm)}`);
    lines.push(`L${n} b${n}a b${n}b ${num(inductanceOf(br))}`);
    lines.push(`C${n} b${n}b 2 ${num(br.c1F)}`);
  });
  lines.push(`.ends ${name}`);
  return `${lines.join('\n')}\n`;
}

/**
 * AT-cut coupling k = 8.8 % (J. R. Vig, "Quartz Crystal Resonators and Oscillators for Frequency
 * Control and Timing Applications — A Tutorial") gives the ideal-plate minimum r = n²π²/(8k²), from
 * C1n = 8k²C0/(nπ)² (QCM review, Sensors 21(10):3490, 2021).
 */
const AT_COUPLING = 0.088;
/** AT-cut Q·f above this is implausible (from memory). */
const AT_MAX_QF_HZ = 1.6e13;

function plausibilityWarnings(model: BvdModel, chosen: number[], info: NetlistInfo): string[] {
  const out: string[] = [];
  for (const bi of chosen) {
    const br = model.branches[bi];
    const q = qualityOf(br);
    const m = 1 / (2 * Math.PI * br.fsHz * model.c0F * br.r1Ohm);
    // Spurious modes are weak by nature; the low-M caution is about the wanted modes.
    if (m < 4 && !info.labels?.[bi]?.spurious)
      out.push(
        `mode at ${g(br.fsHz, 9)} Hz has a low figure of merit M = ${g(m, 3)} (< 4): zero-phase frequencies barely exist`,
      );
    if (info.kind === 'quartz-at' && !info.labels?.[bi]?.spurious) {
      const n = info.labels?.[bi]?.overtone ?? 1;
      const rMin = (n * n * Math.PI * Math.PI) / (8 * AT_COUPLING * AT_COUPLING);
      if (model.c0F / br.c1F < rMin)
        out.push(
          `mode at ${g(br.fsHz, 9)} Hz has r = C0/C1 = ${g(model.c0F / br.c1F, 4)} below the AT-cut minimum ${g(rMin, 5)}`,
        );
      if (q * br.fsHz > AT_MAX_QF_HZ)
        out.push(`mode at ${g(br.fsHz, 9)} Hz has Q*f = ${g(q * br.fsHz, 3)} Hz above the plausible AT-cut limit`);
    }
  }
  return out;
}
