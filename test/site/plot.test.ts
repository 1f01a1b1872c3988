import { describe, expect, it } from 'vitest';
import { layoutPlot, prefixFor, siTickLabel } from '../../src/site/plot.ts';
import { parseCompareSelection } from '../../src/site/compare.ts';
import { formatWithUncertainty } from '../../src/site/format.ts';

// SI prefixes: BIPM SI Brochure; tick choices are d3-scale's (1-2-5 steps, decades on log axes).
describe('layoutPlot', () => {
  const xs = Array.from({ length: 41 }, (_, i) => 11.99e6 + i * 1000);
  const plot = layoutPlot({
    id: 'p',
    title: 't',
    description: 'd',
    xName: 'Frequency',
    xUnit: 'Hz',
    xScale: 'linear',
    panels: [
      {
        yName: '|Z|',
        yUnit: 'Ω',
        yScale: 'log',
        series: [{ label: 'measured', style: 'measured', curve: { x: xs, y: xs.map((x) => 20 + Math.abs(x - 12e6)) } }],
      },
      {
        yName: 'Phase',
        yUnit: '°',
        yScale: 'linear',
        yDomain: [-90, 90],
        yTicks: [-90, 0, 90],
        series: [{ label: 'measured', style: 'measured', curve: { x: xs, y: xs.map(() => 0) } }],
      },
    ],
    markers: [
      { x: 12e6, label: 'fs' },
      { x: 99e6, label: 'outside' },
    ],
  });

  it('labels a linear frequency axis with one prefix and enough decimals to tell ticks apart', () => {
    expect(plot.xLabel).toBe('Frequency (MHz)');
    const labels = plot.xTicks.map((t) => t.label);
    expect(new Set(labels).size).toBe(labels.length);
    expect(labels).toContain('12.00');
  });

  it('labels a log axis per tick with SI prefixes and the unit in the axis label', () => {
    expect(plot.panels[0].yLabel).toBe('|Z| (Ω)');
    expect(plot.panels[0].yTicks.map((t) => t.label)).toEqual(expect.arrayContaining(['100', '1k', '10k']));
    expect(plot.panels[1].yTicks.map((t) => t.label)).toEqual(['−90', '0', '90']);
  });

  it('draws paths, keeps markers inside the x domain, and only the bottom panel shows x labels', () => {
    expect(plot.panels[0].paths[0].d).toMatch(/^M[\d.]+,[\d.]+L/);
    expect(plot.markers.map((m) => m.label)).toEqual(['fs']);
    expect(plot.panels.map((p) => p.showXLabels)).toEqual([false, true]);
    expect(plot.xScaleAttr.split(',')[0]).toBe('linear');
  });

  it('leaves a gap where a log-axis value is not positive', () => {
    const p = layoutPlot({
      id: 'g',
      title: '',
      description: '',
      xName: 'x',
      xUnit: '',
      xScale: 'linear',
      panels: [
        {
          yName: 'y',
          yUnit: '',
          yScale: 'log',
          series: [{ label: 's', style: 'fit', curve: { x: [1, 2, 3, 4], y: [1, 0, 3, 4] } }],
        },
      ],
    });
    expect(p.panels[0].paths[0].d.match(/M/g)).toHaveLength(2);
  });
});

describe('small formatters', () => {
  it('prefixFor and siTickLabel use engineering prefixes', () => {
    expect(prefixFor(12e6)).toEqual([1e6, 'M']);
    expect(siTickLabel(2.2e-12)).toBe('2.2p');
    expect(siTickLabel(1000)).toBe('1k');
  });
  // GUM concise form, one unit per pair (JCGM 100:2008 §7.2.2; the rule is tested in test/lib/units/measured.test.ts).
  it('shows a value to the digits of its uncertainty', () => {
    expect(formatWithUncertainty(24.8123, 0.05, 'Ω')).toBe('24.812(50) Ω');
    expect(formatWithUncertainty(15_915_494.309, 0.02, 'Hz', 9)).toBe('15.915494309(20) MHz');
    expect(formatWithUncertainty(-1.5, 0.25, 'Ω')).toBe('−1.50(25) Ω');
  });
  it('parseCompareSelection reads ?parts=A,B and repeated parts, de-duplicated, at most four', () => {
    expect(parseCompareSelection(new URLSearchParams('parts=A,B'))).toEqual(['A', 'B']);
    expect(parseCompareSelection(new URLSearchParams('parts=A&parts=B,A&parts=C,D,E'))).toEqual(['A', 'B', 'C', 'D']);
    expect(parseCompareSelection(new URLSearchParams('parts=<x>,ok'))).toEqual(['ok']);
  });
});

describe('si', () => {
  // formatSi with two digits would print "6.1e+2 µΩ" for 610 µΩ (toPrecision), a plain number is wanted.
  it('never prints an exponent inside an engineering-notation value', async () => {
    const { si, formatWithUncertainty: fwu } = await import('../../src/site/format.ts');
    expect(si(610e-6, 'Ω', 2)).toBe('610 µΩ');
    expect(fwu(13.99809, 610e-6, 'Ω')).toBe('13.99809(61) Ω');
  });
});
