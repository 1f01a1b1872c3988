/**
 * Touchstone reader and writer (Touchstone File Format Specification v1.1 and v2.0, IBIS Open
 * Forum). One- and two-port S, Z and Y data in RI, MA or DB format.
 *
 * Reading rules (all keywords, units and options case-insensitive):
 * - `!` starts a comment anywhere; full-line comments are kept in `NetworkData.comments`.
 * - Option line `# <unit> <parameter> <format> R <ohm>` in any field order; omitted fields
 *   default to GHz, S, MA, R 50. Only the first option line counts; an option line after the
 *   first data row is an error.
 * - v1 port count from the `.sNp` name ending, else from the first data row (3 numbers:
 *   1-port, 9: 2-port). v2 port count from `[Number of Ports]`. More than 2 ports: refused.
 * - One frequency point may wrap over several lines; a point always starts on a new line.
 * - v1 two-port column order is N11 N21 N12 N22; v2 follows `[Two-Port Data Order]`
 *   (`21_12` = v1 order, `12_21` = N11 N12 N21 N22); `[Matrix Format] Lower|Upper` store
 *   N11, N21|N12, N22 of a symmetric matrix.
 * - v1 Z and Y data are normalised to R (the file holds Z/R and Y·R): denormalised here.
 *   v2 Z and Y data are in ohm and siemens.
 * - v1 two-port noise block: a row whose frequency is not above the previous one and that
 *   has 5 numbers starts the noise data, which is skipped. v2 `[Noise Data]` is skipped.
 * - Frequencies must be finite, non-negative and strictly rising.
 *
 * Speed: one hand-written pass over the string (charCodeAt); decimal numbers of at most 15
 * digits are converted exactly without allocation (m·10^e with m < 2^53 and |e| ≤ 22 is
 * correctly rounded by one IEEE operation), longer ones with Number() on a slice.
 */
import { errorAt, InputError, type Issue } from '../issues.ts';
import type { NetworkData } from '../sweep/sweep.ts';
import { cosSinDeg } from '../sweep/complex.ts';
import {
  checkSweepText,
  MAX_ISSUES_PER_FILE,
  normalizeSweepLimits,
  quoteToken,
  shiftDecimalText,
  type SweepLimits,
  type SweepReadOptions,
} from './limits.ts';

/** Touchstone data format: real/imaginary, magnitude/angle, dB/angle (angles in degrees). */
export type TouchstoneFormat = 'RI' | 'MA' | 'DB';
/** Frequency unit of a Touchstone file. */
export type TouchstoneFreqUnit = 'Hz' | 'kHz' | 'MHz' | 'GHz';

const UNIT_EXP: Record<string, number> = { hz: 0, khz: 3, mhz: 6, ghz: 9 };
const UNIT_NAME: Record<string, TouchstoneFreqUnit> = { hz: 'Hz', khz: 'kHz', mhz: 'MHz', ghz: 'GHz' };
/** Exact powers of ten for the fast number path. */
const POW10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));
/** Full-line comments kept per file (the rest are dropped). */
const MAX_COMMENTS = 10_000;
/** Numbers stored per line; a longer line is an error anyway, only its count matters. */
const LINE_VALUES_CAP = 64;

interface Options {
  unit: string;
  parameter: 'S' | 'Z' | 'Y';
  format: TouchstoneFormat;
  refOhm: number;
}

type Phase = 'header' | 'network' | 'noise' | 'end';

/**
 * Read a Touchstone 1.x or 2.0 file.
 * @param text file contents
 * @param source file name for messages (its `.sNp` ending gives the v1 port count)
 * @param opts limit overrides (tests)
 * @returns the network data, denormalised (S unitless, Z in ohm, Y in siemens), freqHz in Hz
 * @throws InputError with every located issue found
 */
export function parseTouchstone(text: string, source: string, opts: SweepReadOptions = {}): NetworkData {
  return new TouchstoneReader(text, source, normalizeSweepLimits(opts)).read();
}

class TouchstoneReader {
  private readonly text: string;
  private readonly issues: Issue[] = [];
  private readonly comments: string[] = [];
  private stop = false;

  private version: 1 | 2 | 0 = 0;
  private phase: Phase = 'header';
  private options: Options = { unit: 'ghz', parameter: 'S', format: 'MA', refOhm: 50 };
  private optionLine = 0;
  private ports = 0;
  private portsKeywordSeen = false;
  private twoPortOrder: '12_21' | '21_12' | '' = '';
  private matrixFormat: 'full' | 'lower' | 'upper' = 'full';
  private numFreq = -1;
  private numFreqLine = 0;
  private references: number[] = [];
  private referenceWanted = 0;
  private referenceLine = 0;
  private inInformation = false;

  // layout, fixed when the data starts
  private perPoint = 0;
  private pairTargets: number[][] = [];
  private scaleRe = 1;
  private describe = '';

  // output buffers
  private cap = 0;
  private count = 0;
  private freqHz: Float64Array = new Float64Array(0);
  private re: Float64Array[] = [];
  private im: Float64Array[] = [];
  /** Output array per column pair of a row (aliases of re/im entries). */
  private outRe: Float64Array[] = [];
  private outIm: Float64Array[] = [];
  private dupPair = -1;
  private dupTarget = -1;

  // point being assembled over continuation lines
  private pending: Float64Array = new Float64Array(LINE_VALUES_CAP);
  private pendingCount = 0;
  private pendingLine = 0;
  private pendingLines = 0;

  // scratch of the line scanner
  private lineVals: Float64Array = new Float64Array(LINE_VALUES_CAP);
  private badStart = -1;
  private badEnd = -1;

  constructor(
    text: string,
    private readonly source: string,
    private readonly limits: SweepLimits,
  ) {
    this.text = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  }

  read(): NetworkData {
    const pre = checkSweepText(this.text, this.source, this.limits);
    if (pre.length) throw new InputError(pre);
    this.portsFromName();
    const t = this.text;
    const n = t.length;
    let pos = 0;
    let lineNo = 0;
    while (pos < n && !this.stop) {
      let le = t.indexOf('\n', pos);
      if (le < 0) le = n;
      const ls = pos;
      pos = le + 1;
      lineNo++;
      if (le - ls > this.limits.maxLineChars) {
        this.issue(
          lineNo,
          `line is ${le - ls} characters long, over the limit of ${this.limits.maxLineChars}`,
          'line-length',
        );
        continue;
      }
      let p = ls;
      let c = t.charCodeAt(p);
      while (c === 32 || c === 9 || c === 13 || c === 12) c = t.charCodeAt(++p);
      if (p >= le) continue;
      if (c === 33) {
        if (this.comments.length < MAX_COMMENTS) this.comments.push(t.slice(p + 1, le).replace(/\r$/, ''));
        continue;
      }
      if (this.inInformation) {
        if (c === 91 && this.keywordName(p, le) === 'end information') this.inInformation = false;
        continue;
      }
      if (this.phase === 'end') continue;
      if (c === 91) this.keyword(p, le, lineNo);
      else if (c === 35) this.optionLineAt(p, le, lineNo);
      else this.dataLine(p, le, lineNo);
    }
    return this.finish(lineNo);
  }

  // ---------------------------------------------------------------- issues

  private issue(line: number | undefined, message: string, code: string): void {
    if (this.issues.length >= MAX_ISSUES_PER_FILE) {
      this.issues.push(
        errorAt(this.source, line, `too many problems; stopped after ${MAX_ISSUES_PER_FILE}`, { code: 'too-many' }),
      );
      this.stop = true;
      return;
    }
    this.issues.push(errorAt(this.source, line, message, { code }));
  }

  private fatal(line: number | undefined, message: string, code: string): void {
    this.issue(line, message, code);
    this.stop = true;
  }

  // ---------------------------------------------------------------- ports, version

  private portsFromName(): void {
    const m = /\.s(\d+)p$/i.exec(this.source);
    if (!m) return;
    const n = Number(m[1]);
    if (n > 2)
      this.fatal(undefined, `${n}-port data is not supported (at most 2 ports; the name ends in ${m[0]})`, 'ports');
    else if (n >= 1) this.ports = n;
  }

  private decideVersion(isVersionKeyword: boolean): void {
    if (this.version === 0) this.version = isVersionKeyword ? 2 : 1;
  }

  // ---------------------------------------------------------------- option line

  private optionLineAt(p: number, le: number, lineNo: number): void {
    this.decideVersion(false);
    if (this.optionLine > 0) return; // only the first option line counts
    if (this.phase !== 'header') {
      this.issue(lineNo, 'option line after the data; it must come before the first data row', 'option-line');
      return;
    }
    this.optionLine = lineNo;
    const body = this.lineBody(p + 1, le);
    const tokens = body.split(/\s+/).filter((s) => s.length > 0);
    const seen = new Set<string>();
    const once = (what: string, tok: string): boolean => {
      if (seen.has(what)) {
        this.issue(lineNo, `option line gives the ${what} twice (${quoteToken(tok)})`, 'option-line');
        return false;
      }
      seen.add(what);
      return true;
    };
    for (let i = 0; i < tokens.length; i++) {
      const tok = tokens[i];
      const k = tok.toLowerCase();
      if (k in UNIT_EXP) {
        if (once('frequency unit', tok)) this.options.unit = k;
      } else if (k === 's' || k === 'y' || k === 'z') {
        if (once('parameter', tok)) this.options.parameter = k.toUpperCase() as Options['parameter'];
      } else if (k === 'h' || k === 'g') {
        this.fatal(lineNo, `${k.toUpperCase()}-parameter data is not supported (expected S, Z or Y)`, 'parameter');
        return;
      } else if (k === 'ri' || k === 'ma' || k === 'db') {
        if (once('format', tok)) this.options.format = k.toUpperCase() as TouchstoneFormat;
      } else if (k === 'r') {
        const v = tokens[i + 1];
        const r = v === undefined ? NaN : Number(v);
        if (
          v === undefined ||
          !/^[+-]?(\d+(?:\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(v) ||
          !(r > 0) ||
          !Number.isFinite(r)
        ) {
          this.issue(
            lineNo,
            `option R: expected a positive reference resistance in ohm, got ${v === undefined ? 'nothing' : quoteToken(v)}`,
            'option-line',
          );
        } else if (once('reference resistance', tok)) this.options.refOhm = r;
        i++;
      } else {
        this.issue(
          lineNo,
          `unknown option ${quoteToken(tok)} (expected Hz, kHz, MHz, GHz, S, Y, Z, RI, MA, DB or R <ohm>)`,
          'option-line',
        );
      }
    }
  }

  /** Text from p to the line end or a `!`, trimmed. */
  private lineBody(p: number, le: number): string {
    let s = this.text.slice(p, le);
    const bang = s.indexOf('!');
    if (bang >= 0) s = s.slice(0, bang);
    return s.trim();
  }

  // ---------------------------------------------------------------- keywords (v2)

  private keywordName(p: number, le: number): string | undefined {
    const close = this.text.indexOf(']', p);
    if (close < 0 || close >= le) return undefined;
    return this.text
      .slice(p + 1, close)
      .trim()
      .toLowerCase()
      .replace(/\s+/g, ' ');
  }

  private keyword(p: number, le: number, lineNo: number): void {
    const name = this.keywordName(p, le);
    if (name === undefined) {
      this.issue(lineNo, `keyword without closing ']': ${quoteToken(this.lineBody(p, le))}`, 'keyword');
      return;
    }
    const arg = this.lineBody(this.text.indexOf(']', p) + 1, le);
    const shown = `[${this.text.slice(p + 1, this.text.indexOf(']', p)).trim()}]`;
    if (this.version === 0) {
      if (name !== 'version') {
        this.fatal(
          lineNo,
          `keyword ${shown} before [Version]; a Touchstone 2 file starts with [Version] 2.0`,
          'keyword',
        );
        return;
      }
      this.decideVersion(true);
      if (!/^2\.\d+$/.test(arg))
        this.fatal(lineNo, `[Version]: expected 2.0 or 2.1, got ${quoteToken(arg)}`, 'version');
      return;
    }
    if (this.version === 1) {
      const msg =
        name === 'version'
          ? '[Version] must be the first line that is not a comment'
          : `keyword ${shown} in a Touchstone 1 file (a Touchstone 2 file starts with [Version] 2.0)`;
      this.issue(lineNo, msg, 'keyword');
      return;
    }
    if (this.referenceWanted > 0) this.referenceIncomplete();
    if (this.phase === 'network' && name !== 'noise data' && name !== 'end') {
      this.issue(lineNo, `keyword ${shown} inside the network data (expected [Noise Data] or [End])`, 'keyword');
      return;
    }
    if (this.phase === 'network') this.flushPending();
    switch (name) {
      case 'version':
        this.issue(lineNo, 'second [Version]', 'keyword');
        break;
      case 'number of ports': {
        const n = this.positiveInt(arg, shown, lineNo);
        if (n === undefined) return;
        if (n > 2)
          this.fatal(lineNo, `${n}-port data is not supported (at most 2 ports; [Number of Ports] is ${n})`, 'ports');
        else this.ports = n;
        this.portsKeywordSeen = true;
        break;
      }
      case 'two-port data order': {
        const v = arg.toLowerCase();
        if (v === '12_21' || v === '21_12') this.twoPortOrder = v;
        else this.issue(lineNo, `[Two-Port Data Order]: expected 12_21 or 21_12, got ${quoteToken(arg)}`, 'keyword');
        break;
      }
      case 'number of frequencies': {
        const n = this.positiveInt(arg, shown, lineNo);
        if (n !== undefined) {
          this.numFreq = n;
          this.numFreqLine = lineNo;
        }
        break;
      }
      case 'number of noise frequencies':
        this.positiveInt(arg, shown, lineNo);
        break;
      case 'reference':
        if (!this.portsKeywordSeen) {
          this.issue(lineNo, '[Reference] before [Number of Ports]', 'keyword');
          return;
        }
        this.references = [];
        this.referenceWanted = this.ports;
        this.referenceLine = lineNo;
        this.referenceValues(arg, lineNo);
        break;
      case 'matrix format': {
        const v = arg.toLowerCase();
        if (v === 'full' || v === 'lower' || v === 'upper') this.matrixFormat = v;
        else this.issue(lineNo, `[Matrix Format]: expected Full, Lower or Upper, got ${quoteToken(arg)}`, 'keyword');
        break;
      }
      case 'mixed-mode order':
        this.fatal(lineNo, '[Mixed-Mode Order] (mixed-mode data) is not supported', 'keyword');
        break;
      case 'begin information':
        this.inInformation = true;
        break;
      case 'end information':
        this.issue(lineNo, '[End Information] without [Begin Information]', 'keyword');
        break;
      case 'network data':
        this.startNetworkData(lineNo);
        break;
      case 'noise data':
        if (this.phase !== 'network') this.issue(lineNo, '[Noise Data] before [Network Data]', 'keyword');
        this.phase = 'noise';
        break;
      case 'end':
        if (this.phase === 'header') this.issue(lineNo, '[End] before [Network Data]', 'keyword');
        this.phase = 'end';
        break;
      default:
        // keywords of later revisions that do not change the data layout are ignored
        break;
    }
  }

  private positiveInt(arg: string, shown: string, lineNo: number): number | undefined {
    if (!/^\d+$/.test(arg) || Number(arg) < 1) {
      this.issue(lineNo, `${shown}: expected a whole number of at least 1, got ${quoteToken(arg)}`, 'keyword');
      return undefined;
    }
    return Number(arg);
  }

  private referenceValues(body: string, lineNo: number): void {
    for (const tok of body.split(/\s+/)) {
      if (!tok) continue;
      const v = Number(tok);
      if (this.referenceWanted === 0) {
        this.issue(lineNo, `[Reference]: more values than ports (${this.ports}), got ${quoteToken(tok)}`, 'reference');
        return;
      }
      if (!/^[+-]?(\d+(?:\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(tok) || !(v > 0) || !Number.isFinite(v)) {
        this.issue(lineNo, `[Reference]: expected a positive resistance in ohm, got ${quoteToken(tok)}`, 'reference');
        this.referenceWanted = 0;
        return;
      }
      this.references.push(v);
      this.referenceWanted--;
    }
  }

  private referenceIncomplete(): void {
    this.issue(
      this.referenceLine,
      `[Reference]: expected ${this.ports} values (one per port), got ${this.references.length}`,
      'reference',
    );
    this.referenceWanted = 0;
    this.references = [];
  }

  private startNetworkData(lineNo: number): void {
    if (this.phase !== 'header') {
      this.issue(lineNo, 'second [Network Data]', 'keyword');
      return;
    }
    if (!this.portsKeywordSeen) {
      this.fatal(lineNo, 'missing [Number of Ports] before [Network Data] (required in Touchstone 2)', 'keyword');
      return;
    }
    if (this.ports === 2 && this.twoPortOrder === '') {
      this.issue(
        lineNo,
        'missing [Two-Port Data Order] before [Network Data] (required for 2-port data: 12_21 or 21_12)',
        'keyword',
      );
      this.twoPortOrder = '21_12';
    }
    if (this.numFreq < 0) {
      this.issue(lineNo, 'missing [Number of Frequencies] before [Network Data] (required in Touchstone 2)', 'keyword');
    }
    this.setLayout();
    this.phase = 'network';
  }

  // ---------------------------------------------------------------- data

  /** Fix the per-point layout from ports, matrix format, order and options. */
  private setLayout(): void {
    const P = this.ports;
    if (P === 1) this.pairTargets = [[0]];
    else if (this.matrixFormat === 'lower') this.pairTargets = [[0], [2, 1], [3]];
    else if (this.matrixFormat === 'upper') this.pairTargets = [[0], [1, 2], [3]];
    else if (this.version === 2 && this.twoPortOrder === '12_21') this.pairTargets = [[0], [1], [2], [3]];
    else this.pairTargets = [[0], [2], [1], [3]];
    this.perPoint = 1 + 2 * this.pairTargets.length;
    const { parameter, refOhm, format } = this.options;
    // v1 Z and Y data are normalised to R (Touchstone v1.1; from memory, checked against two public readers)
    this.scaleRe = this.version === 1 ? (parameter === 'Z' ? refOhm : parameter === 'Y' ? 1 / refOhm : 1) : 1;
    const tri = P === 2 && this.matrixFormat !== 'full' ? `, ${this.matrixFormat} triangle` : '';
    this.describe = `${P}-port ${format}${tri}`;
    const entries = P * P;
    // rough first guess from the text size, grown by doubling when short
    this.cap = Math.max(16, Math.min(this.limits.maxPoints + 1, Math.ceil(this.text.length / (this.perPoint * 12))));
    this.freqHz = new Float64Array(this.cap);
    this.re = Array.from({ length: entries }, () => new Float64Array(this.cap));
    this.im = Array.from({ length: entries }, () => new Float64Array(this.cap));
    this.bindTargets();
  }

  /** Point the per-column-pair output arrays at the matrix entries (after allocation or growth). */
  private bindTargets(): void {
    this.outRe = this.pairTargets.map((t) => this.re[t[0]]);
    this.outIm = this.pairTargets.map((t) => this.im[t[0]]);
    this.dupPair = this.pairTargets.findIndex((t) => t.length > 1);
    this.dupTarget = this.dupPair >= 0 ? this.pairTargets[this.dupPair][1] : -1;
  }

  private dataLine(p: number, le: number, lineNo: number): void {
    if (this.referenceWanted > 0) {
      this.referenceValues(this.lineBody(p, le), lineNo);
      return;
    }
    if (this.phase === 'noise') return;
    if (this.version === 2 && this.phase === 'header') {
      this.issue(lineNo, 'data before [Network Data]', 'keyword');
      return;
    }
    this.decideVersion(false);
    // a line that starts a point begins with the frequency: scale it to Hz on the text
    const count = this.scanNumbers(p, le, this.pendingCount === 0 ? UNIT_EXP[this.options.unit] : 0);
    if (this.badStart >= 0) {
      this.badToken(lineNo);
      this.pendingCount = 0;
      return;
    }
    if (this.phase === 'header') {
      // v1: the first data row fixes the layout
      if (this.ports === 0) {
        if (count === 3) this.ports = 1;
        else if (count === 9) this.ports = 2;
        else {
          this.fatal(
            lineNo,
            `cannot tell the port count from a first data row of ${count} numbers (1-port rows have 3, 2-port rows 9); name the file .s1p or .s2p`,
            'ports',
          );
          return;
        }
      }
      this.setLayout();
      this.phase = 'network';
    }
    this.addLine(count, lineNo, p, le);
  }

  private addLine(count: number, lineNo: number, p: number, le: number): void {
    const need = this.perPoint;
    const vals = this.lineVals;
    if (this.pendingCount === 0) {
      // a new point starts on this line
      const f = vals[0];
      if (this.version === 1 && this.ports === 2 && this.count > 0 && count === 5 && f <= this.freqHz[this.count - 1]) {
        this.phase = 'noise'; // v1 two-port noise block
        return;
      }
      if (count === need) {
        this.commit(vals, lineNo);
        return;
      }
      if (count > need) {
        this.issue(lineNo, `expected ${need} numbers per row (${this.describe}), got ${count}`, 'touchstone-row');
        return;
      }
      this.pending.set(vals.subarray(0, count));
      this.pendingCount = count;
      this.pendingLine = lineNo;
      this.pendingLines = 1;
      return;
    }
    // continuation of a wrapped point
    const total = this.pendingCount + count;
    if (total <= need) {
      this.pending.set(vals.subarray(0, count), this.pendingCount);
      this.pendingCount = total;
      this.pendingLines++;
      if (total === need) {
        this.pendingCount = 0;
        this.commit(this.pending, this.pendingLine);
      }
      return;
    }
    // the wrapped point does not end at a line end: report it, then read this line afresh
    this.reportShortPoint();
    this.scanNumbers(p, le, UNIT_EXP[this.options.unit]);
    this.addLine(count, lineNo, p, le);
  }

  /** Report the point being assembled as short and drop it. */
  private reportShortPoint(): void {
    const span = this.pendingLines > 1 ? ` over ${this.pendingLines} lines` : '';
    this.issue(
      this.pendingLine,
      `expected ${this.perPoint} numbers per row (${this.describe}), got ${this.pendingCount}${span}`,
      'touchstone-row',
    );
    this.pendingCount = 0;
  }

  private flushPending(): void {
    if (this.pendingCount > 0) this.reportShortPoint();
  }

  private commit(vals: Float64Array, lineNo: number): void {
    const f = vals[0];
    const i = this.count;
    if (f < 0) {
      this.issue(lineNo, `negative frequency ${f} Hz`, 'frequency');
      return;
    }
    if (i > 0 && !(f > this.freqHz[i - 1])) {
      this.issue(
        lineNo,
        `frequency ${f} Hz is not above the previous one (${this.freqHz[i - 1]} Hz); frequencies must rise`,
        'frequency',
      );
      return;
    }
    if (i >= this.limits.maxPoints) {
      this.fatal(lineNo, `more than ${this.limits.maxPoints} frequency points`, 'size');
      return;
    }
    if (i >= this.cap) this.grow();
    this.freqHz[i] = f;
    const scale = this.scaleRe;
    const outRe = this.outRe;
    const outIm = this.outIm;
    const pairs = outRe.length;
    if (this.options.format === 'RI') {
      for (let k = 0; k < pairs; k++) {
        outRe[k][i] = vals[1 + 2 * k] * scale;
        outIm[k][i] = vals[2 + 2 * k] * scale;
      }
    } else {
      const db = this.options.format === 'DB';
      for (let k = 0; k < pairs; k++) {
        const a = vals[1 + 2 * k];
        const mag = (db ? Math.pow(10, a / 20) : a) * scale;
        const cs = cosSinDeg(vals[2 + 2 * k]);
        outRe[k][i] = mag * cs[0];
        outIm[k][i] = mag * cs[1];
      }
    }
    // A finite number can still overflow on conversion (DB above ~6000 dB, v1 Z/Y denormalised
    // by R): refuse the row rather than hand Infinity or NaN to the extraction.
    for (let k = 0; k < pairs; k++) {
      if (!Number.isFinite(outRe[k][i]) || !Number.isFinite(outIm[k][i])) {
        this.issue(
          lineNo,
          `values of column pair ${k + 1} overflow to ${outRe[k][i]}, ${outIm[k][i]} after conversion (${this.describe}${this.scaleRe !== 1 ? `, times ${this.scaleRe} for normalisation` : ''}); expected magnitudes below 1e308`,
          'number',
        );
        return;
      }
    }
    // Lower/Upper matrices: the off-diagonal pair fills both N12 and N21
    const dup = this.dupPair;
    if (dup >= 0) {
      this.re[this.dupTarget][i] = outRe[dup][i];
      this.im[this.dupTarget][i] = outIm[dup][i];
    }
    this.count = i + 1;
  }

  private grow(): void {
    const cap = Math.min(this.cap * 2, this.limits.maxPoints + 1);
    const grow = (a: Float64Array): Float64Array => {
      const b = new Float64Array(cap);
      b.set(a);
      return b;
    };
    this.freqHz = grow(this.freqHz);
    this.re = this.re.map(grow);
    this.im = this.im.map(grow);
    this.cap = cap;
    this.bindTargets();
  }

  private badToken(lineNo: number): void {
    const tok = this.text.slice(this.badStart, this.badEnd);
    if (/^[+-]?(nan|inf|infinity)$/i.test(tok) || /^[+-]?(\d+(?:\.\d*)?|\.\d+)[eE][+-]?\d+$/.test(tok)) {
      this.issue(lineNo, `value ${quoteToken(tok)} is not a finite number`, 'number');
    } else {
      this.issue(lineNo, `expected a number, got ${quoteToken(tok)}`, 'number');
    }
  }

  /**
   * Scan the numbers of one line (up to a `!`), storing up to LINE_VALUES_CAP of them in
   * lineVals; the first is multiplied by 10^shift on its decimal text (frequency unit).
   * Returns how many there are; sets badStart/badEnd to the first token that is not a
   * finite decimal number (or −1).
   */
  private scanNumbers(p: number, le: number, shift: number): number {
    const t = this.text;
    const vals = this.lineVals;
    let count = 0;
    this.badStart = -1;
    while (p < le) {
      let c = t.charCodeAt(p);
      if (c === 32 || c === 9 || c === 13 || c === 12) {
        p++;
        continue;
      }
      if (c === 33) break;
      const start = p;
      let neg = false;
      if (c === 45 || c === 43) {
        neg = c === 45;
        c = t.charCodeAt(++p);
      }
      let m = 0;
      let nd = 0;
      let frac = 0;
      while (c >= 48 && c <= 57) {
        m = m * 10 + (c - 48);
        nd++;
        c = t.charCodeAt(++p);
      }
      if (c === 46) {
        c = t.charCodeAt(++p);
        while (c >= 48 && c <= 57) {
          m = m * 10 + (c - 48);
          nd++;
          frac++;
          c = t.charCodeAt(++p);
        }
      }
      let ok = nd > 0;
      let e = 0;
      const ePos = p;
      if (ok && (c === 101 || c === 69)) {
        c = t.charCodeAt(++p);
        let eneg = false;
        if (c === 45 || c === 43) {
          eneg = c === 45;
          c = t.charCodeAt(++p);
        }
        let ed = 0;
        while (c >= 48 && c <= 57) {
          if (e < 100000) e = e * 10 + (c - 48);
          ed++;
          c = t.charCodeAt(++p);
        }
        if (ed === 0) ok = false;
        if (eneg) e = -e;
      }
      // a number must end at white space, a comment or the line end (NaN: end of text)
      if (!(c === 32 || c === 9 || c === 13 || c === 12 || c === 10 || c === 33 || c !== c)) ok = false;
      let v = 0;
      if (ok) {
        const k = count === 0 ? shift : 0;
        const e10 = e - frac + k;
        if (nd <= 15 && e10 >= -22 && e10 <= 22) {
          v = e10 < 0 ? m / POW10[-e10] : m * POW10[e10];
          if (neg) v = -v;
        } else {
          v = k === 0 ? Number(t.slice(start, p)) : Number(`${t.slice(start, ePos)}e${e + k}`);
          if (!Number.isFinite(v)) ok = false;
        }
      }
      if (!ok) {
        while (p < le) {
          c = t.charCodeAt(p);
          if (c === 32 || c === 9 || c === 13 || c === 12 || c === 33) break;
          p++;
        }
        this.badStart = start;
        this.badEnd = p;
        return count + 1;
      }
      if (count < LINE_VALUES_CAP) vals[count] = v;
      count++;
    }
    return count;
  }

  // ---------------------------------------------------------------- result

  private finish(lastLine: number): NetworkData {
    if (!this.stop) {
      if (this.referenceWanted > 0) this.referenceIncomplete();
      if (this.phase === 'network') this.flushPending();
      if (this.version === 2 && this.phase === 'header') {
        this.issue(lastLine, 'missing [Network Data] in a Touchstone 2 file', 'keyword');
      }
      if (this.count === 0 && this.issues.length === 0) {
        this.issue(undefined, 'no network data (expected rows of a frequency followed by values)', 'empty');
      }
      if (this.version === 2 && this.numFreq >= 0 && this.count !== this.numFreq && this.issues.length === 0) {
        this.issue(
          this.numFreqLine,
          `[Number of Frequencies] is ${this.numFreq} but the network data has ${this.count} frequency points`,
          'count',
        );
      }
    }
    if (this.issues.length) throw new InputError(this.issues);
    const n = this.count;
    const P = this.ports as 1 | 2;
    const ref =
      this.version === 2 && this.references.length === P
        ? this.references
        : Array.from({ length: P }, () => this.options.refOhm);
    return {
      parameter: this.options.parameter,
      ports: P,
      z0Ohm: ref,
      freqHz: this.freqHz.slice(0, n),
      re: this.re.map((a) => a.slice(0, n)),
      im: this.im.map((a) => a.slice(0, n)),
      source: this.source,
      format: this.version === 2 ? 'touchstone-2' : 'touchstone-1',
      comments: this.comments,
    };
  }
}

// ==================================================================== writer

/** Options of {@link formatTouchstone}. */
export interface FormatTouchstoneOptions {
  /** Touchstone version; default 1 (a `.s1p`/`.s2p` file). */
  version?: 1 | 2;
  /** Data format; default RI. */
  format?: TouchstoneFormat;
  /** Frequency unit; default Hz (full precision with no scaling). */
  freqUnit?: TouchstoneFreqUnit;
  /** Comment lines written first; line breaks inside a comment start new `!` lines. */
  comments?: string[];
}

/**
 * Write network data as Touchstone text with the shortest round-trip decimal form of every
 * number (17 significant digits at most, so reading it back gives the same doubles; the
 * frequency's decimal point is moved for the unit, so it reads back exactly too). Canonical option line `# <unit> <param> <format> R <ohm>`.
 * v1 normalises Z and Y to R and needs equal reference impedances on both ports; v2 writes
 * `[Reference]` per port, two-port order 12_21, and Z/Y in ohm/siemens. In DB format a zero
 * magnitude is written as 20·log10(Number.MIN_VALUE) ≈ -6466 dB (20·log10(0) is -Infinity, which
 * no reader accepts); it reads back as a magnitude below 1e-323.
 * @throws Error when v1 is asked for unequal port reference impedances
 */
export function formatTouchstone(data: NetworkData, opts: FormatTouchstoneOptions = {}): string {
  const version = opts.version ?? 1;
  const format = opts.format ?? 'RI';
  const unit = opts.freqUnit ?? 'Hz';
  const unitExp = UNIT_EXP[unit.toLowerCase()];
  const P = data.ports;
  const ref = data.z0Ohm[0];
  if (version === 1 && data.z0Ohm.some((z) => z !== ref)) {
    throw new Error(
      `touchstone 1 cannot hold unequal port reference impedances (${data.z0Ohm.join(', ')} ohm); write version 2`,
    );
  }
  const out: string[] = [];
  for (const c of opts.comments ?? []) {
    for (const line of c.split(/\r\n|[\n\r\u2028\u2029\u0085\v\f]/))
      out.push(`!${line.replace(/[\u0000-\u0008\u000e-\u001f\u007f]/g, ' ')}`);
  }
  const option = `# ${UNIT_NAME[unit.toLowerCase()]} ${data.parameter} ${format} R ${num(ref)}`;
  const scale = version === 1 ? (data.parameter === 'Z' ? 1 / ref : data.parameter === 'Y' ? ref : 1) : 1;
  // matrix index per written pair
  const order = P === 1 ? [0] : version === 2 ? [0, 1, 2, 3] : [0, 2, 1, 3];
  if (version === 2) {
    out.push('[Version] 2.0', option, `[Number of Ports] ${P}`);
    if (P === 2) out.push('[Two-Port Data Order] 12_21');
    out.push(
      `[Number of Frequencies] ${data.freqHz.length}`,
      `[Reference] ${data.z0Ohm.map(num).join(' ')}`,
      '[Network Data]',
    );
  } else {
    out.push(option);
  }
  const n = data.freqHz.length;
  for (let i = 0; i < n; i++) {
    let row = shiftDecimalText(data.freqHz[i], -unitExp);
    for (const k of order) {
      const x = data.re[k][i] * scale;
      const y = data.im[k][i] * scale;
      if (format === 'RI') row += ` ${num(x)} ${num(y)}`;
      else {
        const mag = Math.hypot(x, y);
        const ang = (Math.atan2(y, x) * 180) / Math.PI;
        // DB: a zero magnitude (ideal isolation) is written as the smallest positive double's
        // level, 20·log10(5e-324) ≈ -6466 dB, which reads back as 5e-324 or 0, never -Infinity
        row += ` ${num(format === 'MA' ? mag : 20 * Math.log10(Math.max(mag, Number.MIN_VALUE)))} ${num(ang)}`;
      }
    }
    out.push(row);
  }
  if (version === 2) out.push('[End]');
  return `${out.join('\n')}\n`;
}

/** Shortest decimal that reads back to the same double. */
function num(x: number): string {
  return Object.is(x, -0) ? '0' : String(x);
}
