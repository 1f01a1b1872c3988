/**
 * Size limits and text sanity checks shared by the sweep-file readers (Touchstone, CSV).
 *
 * The limits guard the build against a stray huge or binary file; real crystal sweeps are
 * a few thousand points. Sizes are counted in UTF-16 code units of the decoded text, which
 * equals bytes for the ASCII files these readers expect.
 */
import { errorAt, type Issue } from '../issues.ts';

/** Largest sweep file accepted, in bytes (text length). */
export const MAX_SWEEP_BYTES = 64 * 1024 * 1024;
/** Most frequency points accepted in one sweep. */
export const MAX_SWEEP_POINTS = 2_000_000;
/** Longest single line accepted, in characters. */
export const MAX_SWEEP_LINE_CHARS = 1024 * 1024;

/** Overrides of the limits (tests use small ones instead of building 64 MB strings). */
export interface SweepReadOptions {
  /** Largest text accepted, bytes; default {@link MAX_SWEEP_BYTES}. */
  maxBytes?: number;
  /** Most frequency points accepted; default {@link MAX_SWEEP_POINTS}. */
  maxPoints?: number;
  /** Longest line accepted, characters; default {@link MAX_SWEEP_LINE_CHARS}. */
  maxLineChars?: number;
}

/** The limits with every default filled in. */
export interface SweepLimits {
  maxBytes: number;
  maxPoints: number;
  maxLineChars: number;
}

/** Fill the defaults of {@link SweepReadOptions}. */
export function normalizeSweepLimits(opts: SweepReadOptions = {}): SweepLimits {
  return {
    maxBytes: opts.maxBytes ?? MAX_SWEEP_BYTES,
    maxPoints: opts.maxPoints ?? MAX_SWEEP_POINTS,
    maxLineChars: opts.maxLineChars ?? MAX_SWEEP_LINE_CHARS,
  };
}

/** How many leading characters are checked for control characters (NUL is searched everywhere). */
const BINARY_PROBE_CHARS = 8192;

/** Readers stop collecting after this many issues in one file (and say so). */
export const MAX_ISSUES_PER_FILE = 100;

/**
 * File-level checks done before parsing: size limit and binary content (NUL anywhere,
 * control characters other than tab/CR/LF/FF or U+FFFD decoding errors near the start).
 * Returns the issues found; an empty list means the text may be parsed.
 */
export function checkSweepText(text: string, source: string, limits: SweepLimits): Issue[] {
  if (text.length > limits.maxBytes) {
    return [
      errorAt(source, undefined, `file is ${text.length} bytes, over the limit of ${limits.maxBytes} bytes`, {
        code: 'size',
      }),
    ];
  }
  const nul = text.indexOf('\u0000');
  if (nul >= 0) return [binaryIssue(text, source, nul)];
  const end = Math.min(text.length, BINARY_PROBE_CHARS);
  for (let i = 0; i < end; i++) {
    const c = text.charCodeAt(i);
    if ((c < 32 && c !== 9 && c !== 10 && c !== 13 && c !== 12) || c === 0xfffd || c === 127) {
      return [binaryIssue(text, source, i)];
    }
  }
  return [];
}

function binaryIssue(text: string, source: string, at: number): Issue {
  const code = text.charCodeAt(at).toString(16).padStart(4, '0');
  return errorAt(source, lineOfIndex(text, at), `binary data (character U+${code}), expected a text file`, {
    code: 'binary',
  });
}

/** 1-based line number of a character index. */
export function lineOfIndex(text: string, index: number): number {
  let line = 1;
  for (let p = text.indexOf('\n'); p >= 0 && p < index; p = text.indexOf('\n', p + 1)) line++;
  return line;
}

/** Quote a token for a message, shortened when long. */
export function quoteToken(token: string, max = 40): string {
  const t = token.length > max ? `${token.slice(0, max)}…` : token;
  return `'${t}'`;
}

// ---- decimal text helpers shared by the readers and writers

/**
 * Value of a decimal number text times 10^k, correctly rounded (the shift is done on the
 * text, so `32.760` kHz gives exactly 32760 Hz, not 32759.999999999996). The text must be a
 * valid decimal (sign, digits, point, exponent).
 */
export function parseScaledDecimal(s: string, k: number): number {
  if (k === 0) return Number(s);
  const e = s.search(/[eE]/);
  return e < 0 ? Number(`${s}e${k}`) : Number(`${s.slice(0, e)}e${Number(s.slice(e + 1)) + k}`);
}

/**
 * Decimal text of x·10^k, written from the shortest round-trip form of x by moving the point
 * (so `parseScaledDecimal(shiftDecimalText(x, -6), 6) === x` for every finite x).
 */
export function shiftDecimalText(x: number, k: number): string {
  const s = Object.is(x, -0) ? '0' : String(x);
  if (k === 0) return s;
  const e = s.indexOf('e');
  if (e >= 0) return `${s.slice(0, e)}e${Number(s.slice(e + 1)) + k}`;
  const sign = s[0] === '-' ? '-' : '';
  const body = sign ? s.slice(1) : s;
  const dot = body.indexOf('.');
  const ip = dot < 0 ? body : body.slice(0, dot);
  const fp = dot < 0 ? '' : body.slice(dot + 1);
  let digits = ip + fp;
  let point = ip.length + k;
  if (point <= 0) {
    digits = '0'.repeat(1 - point) + digits;
    point = 1;
  }
  if (point >= digits.length) digits += '0'.repeat(point - digits.length);
  const intPart = digits.slice(0, point).replace(/^0+(?=\d)/, '');
  const frac = digits.slice(point).replace(/0+$/, '');
  const out = frac ? `${intPart}.${frac}` : intPart;
  return /^0(\.0*)?$/.test(out) ? '0' : sign + out;
}
