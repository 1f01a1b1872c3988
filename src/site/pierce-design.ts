/**
 * The design views of one part in one circuit, beside the capacitor advice: the negative
 * resistance against load capacitance (curve with the extracted R1, the datasheet maximum ESR and
 * the chosen capacitors marked), the start-up estimate and the frequency budget table.
 * Build time only; data from the part's own page data (advice and calculator inputs).
 */
import { layoutPlot, type PlotLayout, type PlotSpec, type SeriesSpec, type SeriesStyle } from './plot.ts';
import { formatNumber, formatQty } from './format.ts';
import type { CalculatorData, CompareData, PierceAdvice } from './types.ts';
import { negativeResistanceCurve, type NegativeResistanceCurve } from '../lib/osc/negative-resistance-curve.ts';

export interface BudgetView {
  caption: string;
  headers: string[];
  rows: string[][];
  total: string[][];
  summary: string;
  verdict: 'pass' | 'warn' | 'fail' | 'unknown';
}

export interface PierceDesignView {
  curve?: PlotLayout;
  budget?: BudgetView;
  /** The start-up caution shown beside the curve (the figures are in the checks above). */
  startup?: string;
}

function ppm(x: number): string {
  const t = formatNumber(x, 3);
  return x > 0 ? `+${t} ppm` : `${t} ppm`;
}

/** The curve of one circuit from the calculator inputs (same model and circuit as the advice). */
export function curveFor(
  calc: CalculatorData | undefined,
  circuitName: string,
  chosenClF?: number,
): NegativeResistanceCurve | undefined {
  const circuit = calc?.circuits.find((c) => c.name === circuitName);
  if (!calc || !circuit) return undefined;
  const maxExternalF = Math.max(40e-12, 4 * (chosenClF ?? 0));
  return negativeResistanceCurve({
    model: calc.model,
    mainBranch: calc.mainBranch,
    circuit,
    esrMaxOhm: calc.datasheet?.esrMaxOhm,
    chosenClF,
    maxExternalF,
  });
}

/** Series of one curve: |R| seen by the motional branch and by the pins, R1 and the ESR limit as flat lines. */
export function curveSeries(c: NegativeResistanceCurve, label = ''): SeriesSpec[] {
  const ends = [c.clF[0], c.clF[c.clF.length - 1]];
  const out: SeriesSpec[] = [
    { label: `${label}|R| motional branch`, style: 'measured', curve: { x: c.clF, y: c.motionalOhm } },
    { label: `${label}|R| crystal pins`, style: 'model', curve: { x: c.clF, y: c.pinsOhm } },
    { label: `${label}R1 (extracted)`, style: 'c2', curve: { x: ends, y: [c.r1Ohm, c.r1Ohm] } },
  ];
  if (c.esrMaxOhm !== undefined)
    out.push({ label: `${label}max ESR`, style: 'c3', curve: { x: ends, y: [c.esrMaxOhm, c.esrMaxOhm] } });
  return out;
}

/** The curve as a plot. */
export function curvePlot(c: NegativeResistanceCurve, id: string): PlotLayout {
  const crossing = c.clF.find(
    (_, k) => c.motionalOhm[k] < c.r1Ohm && k > c.motionalOhm.indexOf(Math.max(...c.motionalOhm)),
  );
  return layoutPlot({
    id,
    title: `Negative resistance against load capacitance, ${c.circuit}`,
    description:
      `Small-signal negative resistance seen by the motional branch and by the crystal pins, equal capacitors, ` +
      `against load capacitance ${formatQty(c.clF[0], 'F', 3)} to ${formatQty(c.clF[c.clF.length - 1], 'F', 3)}, log axes; ` +
      `R1 ${formatQty(c.r1Ohm, 'Ω', 3)}${c.esrMaxOhm !== undefined ? `, datasheet maximum ESR ${formatQty(c.esrMaxOhm, 'Ω', 3)}` : ''}` +
      `${c.chosenClF !== undefined ? `, chosen ${formatQty(c.chosenClF, 'F', 3)}` : ''}. ` +
      `It starts where the motional-branch curve lies above R1${crossing !== undefined ? ` (up to about ${formatQty(crossing, 'F', 2)})` : ''}.`,
    xName: 'Load capacitance CL',
    xUnit: 'F',
    xScale: 'log',
    panels: [{ yName: '|R|', yUnit: 'Ω', yScale: 'log', series: curveSeries(c) }],
    markers: c.chosenClF !== undefined ? [{ x: c.chosenClF, label: 'chosen' }] : [],
    height: 320,
  });
}

/** Budget, start-up text and curve for one advice. */
export function pierceDesignView(a: PierceAdvice, calc: CalculatorData | undefined, id: string): PierceDesignView {
  const chosen = a.ok ? a.best.clF : undefined;
  const c = curveFor(calc, a.circuit, chosen);
  const view: PierceDesignView = { curve: c ? curvePlot(c, id) : undefined };
  if (!a.ok) return view;
  const b = a.best.budget;
  view.budget = {
    caption: `Frequency budget with the closest pair, ${a.circuit}`,
    headers: ['Term', 'Source', 'Low', 'High'],
    rows: b.terms.map((t) => [t.name, t.source, ppm(t.minPpm), ppm(t.maxPpm)]),
    total: [
      ['Worst case (sum)', '', ppm(b.worstCasePpm.min), ppm(b.worstCasePpm.max)],
      ['Root-sum-square', '', ppm(b.rssPpm.min), ppm(b.rssPpm.max)],
      ...(b.requirementPpm !== undefined
        ? [['Requirement of the circuit', '', ppm(-b.requirementPpm), ppm(b.requirementPpm)]]
        : []),
    ],
    summary: b.reason,
    verdict: b.verdict,
  };
  view.startup =
    'small-signal estimates of the envelope growth from the noise level; confirm start-up on the real board at the lowest supply and both temperature extremes';
  return view;
}

const PART_STYLES: SeriesStyle[] = ['c0', 'c1', 'c2', 'c3'];

/** Circuits with a curve for at least one of the parts, in first-seen order. */
export function compareCircuits(parts: CompareData[]): string[] {
  return [...new Set(parts.flatMap((p) => (p.negativeResistance ?? []).map((c) => c.circuit)))];
}

/** Compare: the negative resistance seen by the motional branch of each part in one circuit, overlaid. */
export function compareNegativeResistanceSpec(parts: CompareData[], circuit: string, id: string): PlotSpec | undefined {
  const withCurve = parts
    .map((p, i) => ({ p, i, c: p.negativeResistance?.find((x) => x.circuit === circuit) }))
    .filter((x) => x.c);
  if (!withCurve.length) return undefined;
  const missing = parts.filter((p) => !p.negativeResistance?.some((x) => x.circuit === circuit)).map((p) => p.id);
  return {
    id,
    title: `Negative resistance against load capacitance in ${circuit}`,
    description:
      `Magnitude of the small-signal negative resistance seen by the motional branch against load capacitance in circuit ${circuit}, on logarithmic axes, for ` +
      withCurve
        .map(
          ({ p, c }) =>
            `${p.id} (R1 ${formatQty(c!.r1Ohm, 'Ω', 3)}${c!.chosenClF !== undefined ? `, chosen CL ${formatQty(c!.chosenClF, 'F', 3)}` : ''})`,
        )
        .join(', ') +
      `. A part starts where its curve lies above its R1.${missing.length ? ` Not meant for this circuit: ${missing.join(', ')}.` : ''}`,
    xName: 'Load capacitance CL',
    xUnit: 'F',
    xScale: 'log',
    panels: [
      {
        yName: '|R| motional',
        yUnit: 'Ω',
        yScale: 'log',
        series: withCurve.map(({ p, i, c }) => ({
          label: `${p.id} (R1 ${formatQty(c!.r1Ohm, 'Ω', 3)})`,
          style: PART_STYLES[i % 4],
          curve: { x: c!.clF, y: c!.motionalOhm },
        })),
      },
    ],
    markers: withCurve
      .filter(({ c }) => c!.chosenClF !== undefined)
      .map(({ p, c }) => ({ x: c!.chosenClF!, label: p.id })),
    height: 340,
  };
}
