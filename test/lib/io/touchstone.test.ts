/**
 * Touchstone reader: keyword layout, option line, normalisation, wrapping, noise blocks and
 * comments, on hand-written fixtures that follow the Touchstone File Format Specification
 * v1.1 / v2.0 (IBIS Open Forum). Expected values are the numbers in
 * each fixture, converted by the spec's definitions (RI: re, im; MA: mag ∠deg; DB: 20·log10|x|
 * ∠deg; v1 Z/Y normalised to R, v2 Z/Y in ohm/siemens). Writer round trips at the end.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { formatTouchstone, parseTouchstone } from '../../../src/lib/io/touchstone.ts';
import type { NetworkData } from '../../../src/lib/sweep/sweep.ts';

const dir = new URL('../../fixtures/touchstone-spec/', import.meta.url);
const load = (name: string) => parseTouchstone(readFileSync(new URL(name, dir), 'utf8'), name);

/** Matrix entry k (row-major 11, 12, 21, 22) at point i as [re, im]. */
const at = (d: NetworkData, k: number, i: number): [number, number] => [d.re[k][i], d.im[k][i]];
const polar = (mag: number, deg: number): [number, number] => [
  mag * Math.cos((deg * Math.PI) / 180),
  mag * Math.sin((deg * Math.PI) / 180),
];

function expectPair(got: [number, number], want: [number, number], tol = 1e-15) {
  expect(Math.abs(got[0] - want[0])).toBeLessThanOrEqual(tol * Math.max(1, Math.abs(want[0])));
  expect(Math.abs(got[1] - want[1])).toBeLessThanOrEqual(tol * Math.max(1, Math.abs(want[1])));
}

describe('parseTouchstone on Touchstone 2.0 keyword layouts', () => {
  it('reads a one-port MA file in GHz with exact quarter-turn angles', () => {
    const d = load('v2-one-port.s1p');
    expect(d.format).toBe('touchstone-2');
    expect(d.ports).toBe(1);
    expect(d.parameter).toBe('S');
    expect(d.z0Ohm).toEqual([50]);
    expect(Array.from(d.freqHz)).toEqual([0.5e9, 1e9, 1.5e9]);
    expect(at(d, 0, 0)).toEqual([0.5, 0]);
    expect(at(d, 0, 1)).toEqual([0, 0.25]);
    expect(at(d, 0, 2)).toEqual([0, -0.125]);
  });

  it('maps [Two-Port Data Order] 12_21 columns to N11 N12 N21 N22', () => {
    const d = load('v2-two-port-12_21.s2p');
    expect(d.ports).toBe(2);
    expect(Array.from(d.freqHz)).toEqual([10e6, 20e6]);
    expect(at(d, 0, 0)).toEqual([0.11, -0.011]);
    expect(at(d, 1, 0)).toEqual([0.12, -0.012]);
    expect(at(d, 2, 0)).toEqual([0.21, -0.021]);
    expect(at(d, 3, 0)).toEqual([0.22, -0.022]);
    expect(at(d, 2, 1)).toEqual([0.41, -0.041]);
  });

  it('reads the same matrices from a 21_12 file as from the 12_21 file', () => {
    const a = load('v2-two-port-12_21.s2p');
    const b = load('v2-two-port-21_12.s2p');
    expect(b.re.map((x) => Array.from(x))).toEqual(a.re.map((x) => Array.from(x)));
    expect(b.im.map((x) => Array.from(x))).toEqual(a.im.map((x) => Array.from(x)));
  });

  it('takes one reference impedance per port from a [Reference] continued on the next line', () => {
    const d = load('v2-reference-continued.s2p');
    expect(d.z0Ohm).toEqual([50, 75]);
    expect(at(d, 2, 0)).toEqual([0.5, 0]);
  });

  it('fills the symmetric matrix from Lower and Upper formats alike', () => {
    const lo = load('v2-matrix-lower.s2p');
    const up = load('v2-matrix-upper.s2p');
    expect(lo.parameter).toBe('Y');
    expect(Array.from(lo.freqHz)).toEqual([100e3, 200e3]);
    // Y in siemens, not scaled by R in v2
    expect(at(lo, 0, 0)).toEqual([0.011, 0.001]);
    expect(at(lo, 1, 0)).toEqual([-0.01, -0.002]);
    expect(at(lo, 2, 0)).toEqual([-0.01, -0.002]);
    expect(at(lo, 3, 1)).toEqual([0.023, 0.006]);
    expect(up.re.map((x) => Array.from(x))).toEqual(lo.re.map((x) => Array.from(x)));
    expect(up.im.map((x) => Array.from(x))).toEqual(lo.im.map((x) => Array.from(x)));
  });

  it('skips the information block and the noise data', () => {
    const d = load('v2-information-and-noise.s2p');
    expect(d.ports).toBe(2);
    expect(d.freqHz.length).toBe(2);
    // DB: -20 dB ∠0 → 0.1; 0 dB ∠90 → j; -40 dB ∠-90 → -0.01j; -20 dB ∠180 → -0.1 (21_12 order)
    expectPair(at(d, 0, 0), [0.1, 0]);
    expectPair(at(d, 2, 0), [0, 1]);
    expectPair(at(d, 1, 0), [0, -0.01]);
    expectPair(at(d, 3, 0), [-0.1, 0]);
  });

  it('keeps v2 Z data in ohm whatever R says', () => {
    const d = load('v2-z-ohms.s1p');
    expect(d.parameter).toBe('Z');
    expect(d.z0Ohm).toEqual([25]);
    expect(Array.from(d.freqHz)).toEqual([32760, 32768, 32776]);
    expect(at(d, 0, 1)).toEqual([35010.5, 0]);
    expect(at(d, 0, 2)).toEqual([35000, 12000]);
  });
});

describe('parseTouchstone on Touchstone 1.1 files', () => {
  it('denormalises v1 Z data by R', () => {
    const d = load('v1-z-normalised.s1p');
    expect(d.format).toBe('touchstone-1');
    expect(d.parameter).toBe('Z');
    expect(d.z0Ohm).toEqual([25]);
    expect(Array.from(d.freqHz)).toEqual([10e6, 10.5e6]);
    expectPair(at(d, 0, 0), [20, -30]);
    expectPair(at(d, 0, 1), [25, 0]);
  });

  it('denormalises v1 Y data by 1/R and reads the N11 N21 N12 N22 column order', () => {
    const d = load('v1-y-normalised.s2p');
    expectPair(at(d, 0, 0), [0.005, 0.001]);
    expectPair(at(d, 2, 0), [-0.004, -0.002]);
    expectPair(at(d, 1, 0), [-0.003, -0.0005]);
    expectPair(at(d, 3, 0), [0.006, 0.002]);
  });

  it('assembles a frequency point wrapped over several lines', () => {
    const d = load('v1-continuation.s2p');
    expect(Array.from(d.freqHz)).toEqual([1e9, 2e9, 3e9]);
    expect(at(d, 0, 0)).toEqual([0.1, 0.2]);
    expect(at(d, 2, 0)).toEqual([0.3, 0.4]);
    expect(at(d, 1, 0)).toEqual([0.5, 0.6]);
    expect(at(d, 3, 0)).toEqual([0.7, 0.8]);
    expect(at(d, 1, 1)).toEqual([0.51, 0.61]);
    expect(at(d, 3, 1)).toEqual([0.71, 0.81]);
    expect(at(d, 3, 2)).toEqual([0.72, 0.82]);
  });

  it('stops at the v1 two-port noise block', () => {
    const d = load('v1-noise-block.s2p');
    expect(Array.from(d.freqHz)).toEqual([100e6, 200e6, 300e6]);
    expectPair(at(d, 2, 2), polar(1.8, 150));
  });

  it('reads option fields in any order and case, ignores later option lines, keeps comments', () => {
    const d = load('v1-comments-options.s1p');
    expect(d.parameter).toBe('S');
    expect(d.z0Ohm).toEqual([75]);
    expect(Array.from(d.freqHz)).toEqual([15000.5e3, 15001.5e3, 15002.5e3]);
    expect(at(d, 0, 0)).toEqual([0.25, -0.5]);
    expect(at(d, 0, 2)).toEqual([0.35, -0.3]);
    expect(d.comments).toEqual([
      '   conditions: 25 C, -20 dBm, series-thru',
      'second comment',
      ' a second option line is ignored (only the first counts in Touchstone 1)',
    ]);
  });

  it('applies the defaults GHz S MA R 50 without an option line', () => {
    const d = load('v1-defaults.s1p');
    expect(d.parameter).toBe('S');
    expect(d.z0Ohm).toEqual([50]);
    expect(Array.from(d.freqHz)).toEqual([1e9, 2e9]);
    expect(at(d, 0, 0)).toEqual([0, 0.5]);
    expect(at(d, 0, 1)).toEqual([0, -0.25]);
  });

  it('infers the port count from the first row when the name has no .sNp ending', () => {
    const one = parseTouchstone('# Hz S RI\n1 0.1 0.2\n', 'sweep.txt');
    const two = parseTouchstone('# Hz S RI\n1 1 2 3 4 5 6 7 8\n', 'sweep.txt');
    expect(one.ports).toBe(1);
    expect(two.ports).toBe(2);
    expect(at(two, 1, 0)).toEqual([5, 6]);
  });

  it('accepts CRLF line ends, a byte-order mark and signed exponents', () => {
    const d = parseTouchstone('\uFEFF# MHz S RI R 50\r\n1.5E+01 -1.25e-1 +2.5E-01\r\n16 .5 -0.\r\n', 'crlf.s1p');
    expect(Array.from(d.freqHz)).toEqual([15e6, 16e6]);
    expect(at(d, 0, 0)).toEqual([-0.125, 0.25]);
    expect(at(d, 0, 1)).toEqual([0.5, -0]);
  });

  it('reads 17-digit numbers to the same doubles as Number()', () => {
    const d = parseTouchstone('# Hz S RI\n15915494.309189533 0.12345678901234567 -9.8765432109876543e-5\n', 'long.s1p');
    expect(d.freqHz[0]).toBe(15915494.309189533);
    expect(at(d, 0, 0)).toEqual([0.12345678901234567, -9.8765432109876543e-5]);
  });
});

describe('formatTouchstone', () => {
  const net = (parameter: 'S' | 'Z' | 'Y', ports: 1 | 2, z0Ohm: number[]): NetworkData => {
    const n = 5;
    const freqHz = Float64Array.from({ length: n }, (_, i) => 15915494.309189533 + i * 37.123456789);
    const k = ports * ports;
    const re = Array.from({ length: k }, (_, e) =>
      Float64Array.from({ length: n }, (_, i) => Math.sin(1 + e + i * 0.7) / 3),
    );
    const im = Array.from({ length: k }, (_, e) =>
      Float64Array.from({ length: n }, (_, i) => Math.cos(2 + e * 1.3 + i) / 7),
    );
    return { parameter, ports, z0Ohm, freqHz, re, im, source: 'x', format: 'touchstone-1', comments: [] };
  };

  for (const version of [1, 2] as const) {
    for (const parameter of ['S', 'Z', 'Y'] as const) {
      for (const ports of [1, 2] as const) {
        it(`round-trips ${ports}-port ${parameter} data exactly through v${version} RI in Hz`, () => {
          const d = net(parameter, ports, ports === 2 ? [50, 50] : [75]);
          const back = parseTouchstone(formatTouchstone(d, { version }), ports === 2 ? 'a.s2p' : 'a.s1p');
          expect(back.parameter).toBe(parameter);
          expect(back.ports).toBe(ports);
          expect(back.z0Ohm).toEqual(d.z0Ohm);
          expect(Array.from(back.freqHz)).toEqual(Array.from(d.freqHz));
          // v1 Z/Y are divided and multiplied by R: allow the two roundings
          const tol = version === 1 && parameter !== 'S' ? 4e-16 : 0;
          for (let e = 0; e < ports * ports; e++) {
            for (let i = 0; i < 5; i++) {
              expect(Math.abs(back.re[e][i] - d.re[e][i])).toBeLessThanOrEqual(tol * Math.abs(d.re[e][i]));
              expect(Math.abs(back.im[e][i] - d.im[e][i])).toBeLessThanOrEqual(tol * Math.abs(d.im[e][i]));
            }
          }
        });
      }
    }
  }

  for (const format of ['MA', 'DB'] as const) {
    for (const freqUnit of ['kHz', 'MHz', 'GHz'] as const) {
      it(`round-trips 2-port data through ${format} in ${freqUnit}: frequency exactly, values to 1e-14`, () => {
        const d = net('S', 2, [50, 50]);
        const text = formatTouchstone(d, { format, freqUnit });
        expect(text.split('\n')[0]).toBe(`# ${freqUnit} S ${format} R 50`);
        const back = parseTouchstone(text, 'a.s2p');
        for (let i = 0; i < 5; i++) {
          // the writer moves the decimal point of the shortest form, the reader shifts it back
          expect(back.freqHz[i]).toBe(d.freqHz[i]);
          for (let e = 0; e < 4; e++) {
            expect(Math.hypot(back.re[e][i] - d.re[e][i], back.im[e][i] - d.im[e][i])).toBeLessThan(1e-14);
          }
        }
      });
    }
  }

  it('writes unequal port references as v2 [Reference] and refuses them in v1', () => {
    const d = net('S', 2, [50, 75]);
    const text = formatTouchstone(d, { version: 2 });
    expect(text).toContain('[Reference] 50 75\n');
    expect(text).toContain('[Two-Port Data Order] 12_21\n');
    expect(parseTouchstone(text, 'a.ts').z0Ohm).toEqual([50, 75]);
    expect(() => formatTouchstone(d, { version: 1 })).toThrow(/unequal port reference impedances/);
  });

  it('keeps comments inside comment lines even when they contain line breaks', () => {
    const d = net('S', 1, [50]);
    const text = formatTouchstone(d, {
      comments: ['drive -20 dBm\n# GHz Z RI R 1\r[Version] 2.0', 'temperature 25 C'],
    });
    const lines = text.split('\n');
    expect(lines.slice(0, 4)).toEqual(['!drive -20 dBm', '!# GHz Z RI R 1', '![Version] 2.0', '!temperature 25 C']);
    const back = parseTouchstone(text, 'a.s1p');
    expect(back.parameter).toBe('S');
    expect(back.format).toBe('touchstone-1');
    expect(back.comments).toEqual(['drive -20 dBm', '# GHz Z RI R 1', '[Version] 2.0', 'temperature 25 C']);
  });
});

describe('parseTouchstone refuses malformed headers with located messages', () => {
  const messages = (text: string, name = 'x.s1p'): string[] => {
    try {
      parseTouchstone(text, name);
    } catch (e) {
      return (e as { issues: { line?: number; message: string }[] }).issues.map(
        (i) => `${i.line ?? '-'}: ${i.message}`,
      );
    }
    return [];
  };

  it('refuses an option line after the data and repeated option fields', () => {
    expect(messages('1 0.1 0\n# Hz S RI\n')).toEqual([
      '2: option line after the data; it must come before the first data row',
    ]);
    expect(messages('# Hz MHz S RI\n1 0 0\n')).toEqual(["1: option line gives the frequency unit twice ('MHz')"]);
    expect(messages('# Hz S RI R -5\n1 0 0\n')).toEqual([
      "1: option R: expected a positive reference resistance in ohm, got '-5'",
    ]);
    expect(messages('# Hz S RI R\n1 0 0\n')).toEqual([
      '1: option R: expected a positive reference resistance in ohm, got nothing',
    ]);
  });

  it('refuses v2 files with missing or misplaced keywords', () => {
    const head = '[Version] 2.0\n# Hz S RI\n';
    expect(messages(`${head}[Number of Frequencies] 1\n[Network Data]\n1 0 0\n[End]\n`)).toEqual([
      '4: missing [Number of Ports] before [Network Data] (required in Touchstone 2)',
    ]);
    expect(
      messages(
        `${head}[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Reference] 50\n[Network Data]\n1 0 0 0 0 0 0 0 0\n[End]\n`,
        'x.s2p',
      ),
    ).toEqual(['6: [Reference]: expected 2 values (one per port), got 1']);
    expect(
      messages(
        `${head}[Number of Ports] 1\n[Number of Frequencies] 1\n[Reference] 50 0\n[Network Data]\n1 0 0\n[End]\n`,
      ),
    ).toEqual(["5: [Reference]: more values than ports (1), got '0'"]);
    expect(messages(`# Hz S RI\n[Version] 2.0\n1 0 0\n`)).toEqual([
      '2: [Version] must be the first line that is not a comment',
    ]);
    expect(messages(`[Number of Ports] 1\n`)).toEqual([
      '1: keyword [Number of Ports] before [Version]; a Touchstone 2 file starts with [Version] 2.0',
    ]);
    expect(messages(`[Version] 3.0\n`)).toEqual(["1: [Version]: expected 2.0 or 2.1, got '3.0'"]);
    expect(messages(`${head}[Number of Ports] 2\n[Mixed-Mode Order] D2,1 C2,1\n`, 'x.s2p')).toEqual([
      '4: [Mixed-Mode Order] (mixed-mode data) is not supported',
    ]);
    expect(messages(`${head}[Number of Ports] 1\n[Number of Frequencies] 1\n1 0 0\n`)).toEqual([
      '5: data before [Network Data]',
      '5: missing [Network Data] in a Touchstone 2 file',
    ]);
  });

  it('accepts a v2 file without [End] and ignores keywords of later revisions', () => {
    const d = parseTouchstone(
      '[Version] 2.1\n# Hz S RI\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Some Future Keyword] x\n[Network Data]\n1 0.5 0\n',
      'x.s1p',
    );
    expect(d.re[0][0]).toBe(0.5);
  });

  it('reports a wrapped point that is cut short, then reads the next line as a new point', () => {
    expect(messages('# Hz S RI\n1 1 2 3 4\n2 1 2 3 4 5 6 7 8\n3 1 2\n 3 4\n', 'x.s2p')).toEqual([
      '2: expected 9 numbers per row (2-port RI), got 5',
      '4: expected 9 numbers per row (2-port RI), got 5 over 2 lines',
    ]);
  });
});
