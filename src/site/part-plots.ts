/**
 * Plot specifications of a part page (and the compare page): which channels go on which axis,
 * with names, units and a text alternative. layoutPlot (plot.ts) turns them into SVG geometry.
 */
import type { PanelSpec, PlotSpec, SeriesStyle } from './plot.ts';
import type { CompareData, Curve, ModePlot, PullingPlot, TemperaturePlot, WidePlot } from './types.ts';
import { formatHz, formatPpm, formatQty } from './format.ts';
import { modeLabel } from '../lib/models/mode-label.ts';

const PHASE_PANEL = {
  yName: 'Phase',
  yUnit: '°',
  yScale: 'linear' as const,
  yDomain: [-95, 95] as [number, number],
  yTicks: [-90, -45, 0, 45, 90],
  weight: 0.7,
};

function maxOf(c: Curve): number {
  return c.y.reduce((a, b) => (Number.isFinite(b) && b > a ? b : a), 0);
}

/** |Z|, phase and residual around one mode. */
export function modePlotSpec(p: ModePlot, id: string): PlotSpec {
  const resMax = maxOf(p.residualPct);
  const panels: PanelSpec[] = [
    {
      yName: '|Z|',
      yUnit: 'Ω',
      yScale: 'log',
      series: [
        { label: 'measured', style: 'measured', curve: p.measuredMag },
        { label: 'model', style: 'model', curve: p.modelMag },
      ],
    },
    {
      ...PHASE_PANEL,
      series: [
        { label: 'measured', style: 'measured', curve: p.measuredPhase },
        { label: 'model', style: 'model', curve: p.modelPhase },
      ],
    },
    {
      yName: 'Residual',
      yUnit: '%',
      yScale: 'linear',
      weight: 0.55,
      yDomain: [0, Math.max(resMax * 1.1, 0.1)],
      series: [{ label: '|Zmeas − Zmodel|/|Zmodel|', style: 'residual', curve: p.residualPct }],
    },
  ];
  return {
    id,
    title: `${modeLabel(p)} at ${formatHz(p.fsHz, 9)}`,
    description: `Impedance magnitude and phase against frequency around the mode ${modeLabel(p)} (fs ${formatHz(p.fsHz, 10)}, fp ${formatHz(p.fpHz, 10)}), measured (sweep ${p.sweep}) and model, with the relative residual; the largest residual is ${resMax.toPrecision(2)} %.`,
    xName: 'Frequency',
    xUnit: 'Hz',
    xScale: 'linear',
    panels,
    markers: [
      { x: p.fsHz, label: 'fs' },
      { x: p.fpHz, label: 'fp' },
    ],
    height: 470,
  };
}

/** The widest sweep, every mode marked. */
export function widePlotSpec(p: WidePlot, id: string): PlotSpec {
  const x = p.mag.x;
  const ratio = x.length ? x[x.length - 1] / x[0] : 1;
  return {
    id,
    title: `Wide sweep ${p.sweep}`,
    description: `Impedance magnitude and phase over the widest sweep (${formatHz(x[0], 4)} to ${formatHz(x[x.length - 1], 4)}), with ${p.modes.length} mode${p.modes.length === 1 ? '' : 's'} marked: ${p.modes.map((m) => `${m.label} at ${formatHz(m.fsHz, 7)}`).join('; ')}.`,
    xName: 'Frequency',
    xUnit: 'Hz',
    xScale: ratio > 4 ? 'log' : 'linear',
    panels: [
      { yName: '|Z|', yUnit: 'Ω', yScale: 'log', series: [{ label: 'measured', style: 'measured', curve: p.mag }] },
      { ...PHASE_PANEL, series: [{ label: 'measured', style: 'measured', curve: p.phase }] },
    ],
    markers: p.modes.map((m, i) => ({
      x: m.fsHz,
      label: m.spurious ? `s${i + 1}` : m.overtone === 1 ? 'f1' : `f${m.overtone}`,
    })),
    height: 380,
  };
}

/** Frequency offset against load capacitance. */
export function pullingPlotSpec(p: PullingPlot, id: string): PlotSpec {
  const ref =
    p.reference === 'nominal'
      ? `the datasheet frequency ${formatHz(p.referenceHz, 8)}`
      : `fs ${formatHz(p.referenceHz, 10)}`;
  const at =
    p.datasheetClF !== undefined
      ? ` At the datasheet load ${formatQty(p.datasheetClF, 'F', 3)} the offset is ${formatPpm(p.datasheetClPpm)}.`
      : '';
  return {
    id,
    title: 'Pulling: frequency against load capacitance',
    description: `Offset of the load-resonance frequency from ${ref} in ppm, for load capacitances ${formatQty(p.curve.x[0], 'F', 3)} to ${formatQty(p.curve.x[p.curve.x.length - 1], 'F', 3)} (lossless, main mode).${at}`,
    xName: 'Load capacitance CL',
    xUnit: 'F',
    xScale: 'linear',
    panels: [
      {
        yName: p.reference === 'nominal' ? 'Offset from nominal' : 'Offset from fs',
        yUnit: 'ppm',
        yScale: 'linear',
        series: [{ label: 'load resonance', style: 'fit', curve: p.curve }],
      },
    ],
    markers: p.datasheetClF !== undefined ? [{ x: p.datasheetClF, label: 'datasheet CL' }] : [],
    height: 300,
  };
}

/** Frequency against temperature: points and fitted polynomial. */
export function temperaturePlotSpec(p: TemperaturePlot, id: string): PlotSpec {
  return {
    id,
    title: 'Frequency against temperature',
    description: `Offset of fs from ${formatHz(p.f0Hz, 10)} (at ${p.t0C} °C) in ppm at ${p.points.x.length} measured temperatures from ${Math.min(...p.points.x)} °C to ${Math.max(...p.points.x)} °C, with the fitted ${p.form} curve.`,
    xName: 'Temperature',
    xUnit: '°C',
    xScale: 'linear',
    panels: [
      {
        yName: 'Offset',
        yUnit: 'ppm',
        yScale: 'linear',
        series: [
          { label: `${p.form} fit`, style: 'fit', curve: p.fit },
          { label: 'measured', style: 'points', curve: p.points },
        ],
      },
    ],
    height: 300,
  };
}

const PART_STYLES: SeriesStyle[] = ['c0', 'c1', 'c2', 'c3'];

/**
 * Compare: the main modes of several parts overlaid on a common axis — frequency offset from
 * each part's own fs in ppm — so parts of different frequencies can be compared.
 */
export function compareModeSpec(parts: CompareData[], id: string): PlotSpec {
  const toPpm = (c: Curve, fs: number): Curve => ({ x: c.x.map((f) => (f / fs - 1) * 1e6), y: c.y });
  const withMode = parts.filter((p) => p.mode);
  return {
    id,
    title: 'Main mode: |Z| against offset from fs',
    description: `Impedance magnitude of the main mode of ${withMode.map((p) => p.id).join(', ')} against the frequency offset from each part's own fs in ppm; measured lines solid.`,
    xName: 'Offset from fs',
    xUnit: 'ppm',
    xScale: 'linear',
    panels: [
      {
        yName: '|Z|',
        yUnit: 'Ω',
        yScale: 'log',
        series: withMode.map((p) => ({
          label: p.id,
          style: PART_STYLES[parts.indexOf(p) % 4],
          curve: toPpm(p.mode!.measuredMag, p.mode!.fsHz),
        })),
      },
      {
        ...PHASE_PANEL,
        series: withMode.map((p) => ({
          label: p.id,
          style: PART_STYLES[parts.indexOf(p) % 4],
          curve: toPpm(p.mode!.measuredPhase, p.mode!.fsHz),
        })),
      },
    ],
    height: 420,
  };
}

/** Compare: pulling curves overlaid (each against its own reference). */
export function comparePullingSpec(parts: CompareData[], id: string): PlotSpec {
  const withCurve = parts.filter((p) => p.pulling);
  return {
    id,
    title: 'Pulling: offset against load capacitance',
    description: `Load-resonance offset in ppm against load capacitance for ${withCurve.map((p) => `${p.id} (from ${p.pulling!.reference === 'nominal' ? 'its nominal frequency' : 'its fs'})`).join(', ')}.`,
    xName: 'Load capacitance CL',
    xUnit: 'F',
    xScale: 'linear',
    panels: [
      {
        yName: 'Offset',
        yUnit: 'ppm',
        yScale: 'linear',
        series: withCurve.map((p) => ({
          label: p.id,
          style: PART_STYLES[parts.indexOf(p) % 4],
          curve: p.pulling!.curve,
        })),
      },
    ],
    height: 320,
  };
}
