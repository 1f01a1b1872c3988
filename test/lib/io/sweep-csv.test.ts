/**
 * CSV/TSV impedance sweeps per README: The part record ("Sweep files"): header names and units,
 * delimiters, decimal comma in `;` files, quoting, BOM/CRLF, magnitude/phase, and the writer's
 * round trip. Bad files are in bad-sweeps.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { formatSweepCsv, parseSweepCsv } from '../../../src/lib/io/sweep-csv.ts';
import type { ImpedanceSweep } from '../../../src/lib/sweep/sweep.ts';

const arr = (a: Float64Array) => Array.from(a);

describe('parseSweepCsv', () => {
  it('reads the README example header with |Z| in ohm and phase in degrees', () => {
    // the example header of README: The part record
    const s = parseSweepCsv('frequency (MHz),|Z| (ohm),phase (deg)\n12,100,0\n12.5,200,90\n13,50,-90\n', 'a.csv');
    expect(arr(s.freqHz)).toEqual([12e6, 12.5e6, 13e6]);
    expect(arr(s.zRe)).toEqual([100, 0, 0]);
    expect(arr(s.zIm)).toEqual([0, 200, -50]);
    expect(s.source).toBe('a.csv');
  });

  it('reads resistance and reactance under any of their names, case-insensitive, in any column order', () => {
    for (const [r, x] of [
      ['r', 'x'],
      ['RE', 'IM'],
      ['Real', 'Imag'],
      ['resistance', 'reactance'],
    ]) {
      const s = parseSweepCsv(`${x} (ohm),${r},Freq [kHz],note\n-3,20,1000,first\n4,21,1001,second\n`, 'b.csv');
      expect(arr(s.freqHz)).toEqual([1e6, 1.001e6]);
      expect(arr(s.zRe)).toEqual([20, 21]);
      expect(arr(s.zIm)).toEqual([-3, 4]);
    }
  });

  it('applies kohm, Mohm, mohm and Ω units and the phase in radians', () => {
    const s = parseSweepCsv('f (GHz)\tz [kΩ]\ttheta (rad)\n0.001\t2.5\t0\n', 'c.tsv');
    expect(arr(s.freqHz)).toEqual([1e6]);
    expect(arr(s.zRe)).toEqual([2500]);
    const m = parseSweepCsv('f,r (Mohm),x (mohm)\n1,0.0012,-250\n', 'd.csv');
    expect(arr(m.zRe)).toEqual([1200]);
    expect(arr(m.zIm)).toEqual([-0.25]);
    const rad = parseSweepCsv('f,mag (ohm),phase (rad)\n1,2,1.5\n', 'e.csv');
    expect(rad.zRe[0]).toBeCloseTo(2 * Math.cos(1.5), 15);
    expect(rad.zIm[0]).toBeCloseTo(2 * Math.sin(1.5), 15);
  });

  it('reads a decimal comma in semicolon-separated files', () => {
    const s = parseSweepCsv(
      'Messpunkt;frequency (kHz);R (Ohm);X (Ohm)\n;32,760;35000,5;-12,25\n;32,768;35001;0\n',
      'eu.csv',
    );
    expect(arr(s.freqHz)).toEqual([32760, 32768]);
    expect(arr(s.zRe)).toEqual([35000.5, 35001]);
    expect(arr(s.zIm)).toEqual([-12.25, 0]);
  });

  it('handles quotes, a byte-order mark, CRLF, comments, blank and empty trailing lines', () => {
    const text =
      '\uFEFF# bench analyser export\r\n"frequency (Hz)","r (ohm)","x (ohm)","comment, quoted"\r\n\r\n1000,"20",3,"a ""b"", c"\r\n! note\r\n2000,21,4,\r\n,,,\r\n';
    const s = parseSweepCsv(text, 'q.csv');
    expect(arr(s.freqHz)).toEqual([1000, 2000]);
    expect(arr(s.zRe)).toEqual([20, 21]);
    expect(arr(s.zIm)).toEqual([3, 4]);
  });

  it('accepts trailing empty fields beyond the header', () => {
    const s = parseSweepCsv('f,r,x\n1,2,3,,\n', 't.csv');
    expect(arr(s.zIm)).toEqual([3]);
  });

  it('prefers resistance and reactance when both forms are present', () => {
    const s = parseSweepCsv('f,r,x,|z|,phase\n1,3,4,999,0\n', 'both.csv');
    expect([s.zRe[0], s.zIm[0]]).toEqual([3, 4]);
  });
});

describe('formatSweepCsv', () => {
  const sweep: ImpedanceSweep = {
    freqHz: Float64Array.of(15915494.309189534, 15915531.432646323, 15915568.556103112),
    zRe: Float64Array.of(19.999280012345678, 21.5969512, -0),
    zIm: Float64Array.of(-0.11999612345678901, 130.44812345, 4826.817),
    source: 'x.csv',
  };

  for (const delimiter of [',', ';', '\t'] as const) {
    for (const freqUnit of ['Hz', 'kHz', 'MHz', 'GHz'] as const) {
      it(`round-trips r/x exactly with delimiter ${JSON.stringify(delimiter)} and frequency in ${freqUnit}`, () => {
        const text = formatSweepCsv(sweep, { delimiter, freqUnit });
        expect(text.split('\n')[0]).toBe([`frequency (${freqUnit})`, 'r (ohm)', 'x (ohm)'].join(delimiter));
        const back = parseSweepCsv(text, 'x.csv');
        expect(arr(back.freqHz)).toEqual(arr(sweep.freqHz));
        expect(arr(back.zRe)).toEqual([19.999280012345678, 21.5969512, 0]);
        expect(arr(back.zIm)).toEqual(arr(sweep.zIm));
      });
    }
  }

  it('round-trips magnitude and phase to 1e-15 relative', () => {
    const back = parseSweepCsv(formatSweepCsv(sweep, { form: 'magphase' }), 'x.csv');
    for (let i = 0; i < 3; i++) {
      const err = Math.hypot(back.zRe[i] - sweep.zRe[i], back.zIm[i] - sweep.zIm[i]);
      expect(err / Math.hypot(sweep.zRe[i], sweep.zIm[i])).toBeLessThan(1e-15);
    }
  });
});
