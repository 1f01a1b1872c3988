import { describe, expect, it } from 'vitest';
import { inductanceOf } from '../../../src/lib/models/bvd.ts';
import {
  formatNetlist,
  formatSpiceNumber,
  sanitizeCommentText,
  sanitizeSubcktName,
} from '../../../src/lib/models/netlist-spice.ts';
import { OT3, OT3_LABELS, X1 } from './spice-cases.ts';

const ELEMENT = /^[RLC]\d+ \S+ \S+ -?\d\.\d{14}e[+-]\d+$/;

/** Every line is a comment, an element with a plain-exponent value, or the subckt frame. */
function expectOnlySafeLines(text: string): void {
  for (const line of text.trimEnd().split('\n')) {
    expect(line, line).toMatch(
      /^(\* [\x20-\x7e]*|\*|[RLC]\d+ \S+ \S+ \S+|\.subckt [A-Za-z0-9_]+ 1 2|\.ends [A-Za-z0-9_]+)$/,
    );
  }
}

describe('formatNetlist', () => {
  it('writes X1 as C0 plus one R-L-C branch with 15 significant digits and no SPICE suffixes', () => {
    const text = formatNetlist(X1, { partId: 'X1', sample: 'A1' });
    const body = text.split('\n').filter((l) => !l.startsWith('*'));
    expect(body).toEqual([
      '.subckt X1_A1 1 2',
      'C0 1 2 3.00000000000000e-12',
      'R1 1 b1a 2.00000000000000e+1',
      'L1 b1a b1b 1.00000000000000e-2',
      'C1 b1b 2 1.00000000000000e-14',
      '.ends X1_A1',
      '',
    ]);
  });

  it('writes values that read back to the model within 1e-14 relative', () => {
    const text = formatNetlist(OT3, { partId: 'OT3' });
    OT3.branches.forEach((b, i) => {
      const n = i + 1;
      expect(
        Math.abs(Number(new RegExp(`^L${n} \\S+ \\S+ (\\S+)$`, 'm').exec(text)![1]) / inductanceOf(b) - 1),
      ).toBeLessThan(1e-14);
      expect(Number(new RegExp(`^C${n} \\S+ \\S+ (\\S+)$`, 'm').exec(text)![1])).toBe(b.c1F);
    });
    for (const line of text.split('\n').filter((l) => /^[RLC]\d/.test(l))) expect(line).toMatch(ELEMENT);
  });

  it('formats numbers in plain exponent form: 1e-14 with 12 digits is 1.00000000000e-14', () => {
    expect(formatSpiceNumber(1e-14, 12)).toBe('1.00000000000e-14');
    expect(formatSpiceNumber(2.533029591058444e-3)).toBe('2.53302959105844e-3');
  });

  it('states part, sample, conditions, date, method, measured-data and validity cautions in the header', () => {
    const text = formatNetlist(X1, {
      partId: 'XO-0012',
      title: '12 MHz crystal',
      sample: 'A1',
      temperatureC: 25,
      driveW: 10e-6,
      date: '2026-05-02',
      method: 'complex least squares',
      fitResidual: 1.23e-4,
      validSpanHz: { min: 15.9e6, max: 15.95e6 },
    });
    expect(text).toContain('* Motional BVD model of XO-0012 - 12 MHz crystal');
    expect(text).toContain('* sample: A1');
    expect(text).toContain('* conditions: temperature 25 C, drive 10 uW');
    expect(text).toContain('* measured: 2026-05-02');
    expect(text).toContain('* extracted by complex least squares, rms relative fit residual 0.000123');
    expect(text).toContain('MEASURED DATA of one sample');
    expect(text).toContain('not a specification');
    expect(text).toContain(
      'narrow-band linear model: valid only near each listed mode within the measured span 15900000 Hz to 15950000 Hz',
    );
    expect(text).toContain('no drive-level dependence, temperature, aging or amplitude effects');
    expect(text).toContain('.subckt XO_0012_A1 1 2');
  });

  it('never reads a clock: the same inputs give the same text, and a missing date says so', () => {
    const a = formatNetlist(X1, { partId: 'X1' });
    expect(formatNetlist(X1, { partId: 'X1' })).toBe(a);
    expect(a).toContain('* measured: date not recorded');
  });

  it('keeps user text inside its comment line whatever it contains', () => {
    const evil = 'fine\n.include /etc/passwd\r\nR9 1 2 1\u2028.end\u0000 µΩ°';
    const text = formatNetlist(X1, { partId: 'X1', title: evil, sample: 'A1\n.ends', method: 'x\n+ C9 1 2 1' });
    expectOnlySafeLines(text);
    expect(text.split('\n').filter((l) => /^\.(include|end\b)/.test(l))).toEqual([]);
    expect(text).toContain('fine .include /etc/passwd R9 1 2 1 .end uohmdeg');
  });

  it('sanitises the subcircuit name to letters, digits and underscores, starting with a letter', () => {
    expect(sanitizeSubcktName('XO-0012/ä b')).toBe('XO_0012_b');
    expect(sanitizeSubcktName('12M.part')).toBe('X12M_part');
    expect(formatNetlist(X1, { partId: '9 evil\n.end' })).toContain('.subckt X9_evil_end 1 2');
  });

  it('cuts long comment text and turns non-ASCII into ASCII', () => {
    expect(sanitizeCommentText('x'.repeat(500))).toHaveLength(200);
    expect(sanitizeCommentText('25 °C ± 1, 100 µW — ok')).toBe('25 degC +/- 1, 100 uW - ok');
  });

  it('writes every branch of a third-overtone part, then only the main mode, or without the spurious one', () => {
    const all = formatNetlist(OT3, { partId: 'OT3', labels: OT3_LABELS });
    expect(all.match(/^L\d /gm)).toHaveLength(3);
    expect(all).toContain('* branch 2: overtone 3, main mode; fs 100000000 Hz');
    expect(all).toContain('* branch 3: spurious mode near overtone 3');
    const main = formatNetlist(OT3, { partId: 'OT3', labels: OT3_LABELS }, { mainModeOnly: true });
    expect(main.match(/^L\d /gm)).toHaveLength(1);
    expect(main).toContain(`C1 b1b 2 ${formatSpiceNumber(1e-15)}`);
    expect(main).toContain('2 measured modes left out (main mode only)');
    const noSpur = formatNetlist(OT3, { partId: 'OT3', labels: OT3_LABELS }, { includeSpurious: false });
    expect(noSpur.match(/^L\d /gm)).toHaveLength(2);
    expect(noSpur).not.toContain('spurious mode near');
  });

  it('refuses main-mode-only when no branch is labelled main (it never picks one itself)', () => {
    expect(() =>
      formatNetlist(
        OT3,
        { partId: 'OT3', labels: OT3_LABELS.map((l) => ({ ...l, main: false })) },
        { mainModeOnly: true },
      ),
    ).toThrow(/no branch of 3 is labelled main/);
    expect(formatNetlist(X1, { partId: 'X1' }, { mainModeOnly: true }).match(/^L\d /gm)).toHaveLength(1);
  });

  it('flags a low figure of merit and an r below the AT-cut minimum (ideal-plate r, k = 8.8 %)', () => {
    const ceramicLike = { c0F: 20.6e-12, branches: [{ fsHz: 4.005879e6, r1Ohm: 8, c1F: 4.1e-12 }] };
    expect(formatNetlist(ceramicLike, { partId: 'C1', kind: 'quartz-at' })).toMatch(
      /CAUTION: .* r = C0\/C1 = 5\.024 below the AT-cut minimum 159\.3/,
    );
    const lowM = { c0F: 3e-12, branches: [{ fsHz: 100e6, r1Ohm: 200, c1F: 1e-15 }] };
    expect(formatNetlist(lowM, { partId: 'L' })).toMatch(/CAUTION: .* low figure of merit M = 2\.65/);
    expect(formatNetlist(X1, { partId: 'X1', kind: 'quartz-at' })).not.toContain('CAUTION');
  });
});
