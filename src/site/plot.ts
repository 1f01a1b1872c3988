/**
 * Plot layout: turns data channels into everything an SVG needs — path strings, tick positions
 * and labels, marker lines, legend — with d3 scales and line generators, no DOM. Components
 * only print the result; the client hover script reads the scale description back from
 * `data-*` attributes. Missing or non-positive (on log axes) points leave gaps (line.defined).
 */
import { line, scaleLinear, scaleLog, type ScaleContinuousNumeric } from 'd3';
import type { Curve } from './types.ts';
import { prefixFor as siPrefixFor } from '../lib/units/si.ts';

export type SeriesStyle = 'measured' | 'model' | 'residual' | 'fit' | 'points' | 'c0' | 'c1' | 'c2' | 'c3';

export interface SeriesSpec {
  label: string;
  curve: Curve;
  style: SeriesStyle;
}

export interface PanelSpec {
  /** Axis name and unit, e.g. ('|Z|', 'Ω'); unit '' for dimensionless. */
  yName: string;
  yUnit: string;
  yScale: 'log' | 'linear';
  series: SeriesSpec[];
  /** Relative height (default 1). */
  weight?: number;
  /** Fixed domain; otherwise from the data with a margin. */
  yDomain?: [number, number];
  /** Fixed ticks (e.g. phase: −90, −45, 0, 45, 90). */
  yTicks?: number[];
}

export interface PointLinkSpec {
  x: number;
  y: number;
  href: string;
  label: string;
  /** Series index for colour. */
  group?: number;
  /** Passed through to the element as data-id (the client hides filtered points). */
  id?: string;
}

export interface PlotSpec {
  /** Unique on the page; used for clip-path ids. */
  id: string;
  title: string;
  /** Text alternative: what the plot shows, in words. */
  description: string;
  xName: string;
  xUnit: string;
  xScale: 'log' | 'linear';
  xDomain?: [number, number];
  panels: PanelSpec[];
  markers?: Array<{ x: number; label: string }>;
  /** Linked points (drawn in the first panel; overview chart). */
  links?: PointLinkSpec[];
  /** Legend names of the link groups (index = group). */
  groupLabels?: string[];
  width?: number;
  height?: number;
}

export interface Tick {
  pos: number;
  label: string;
}

export interface PathLayout {
  d: string;
  style: SeriesStyle;
  label: string;
}

export interface PanelLayout {
  top: number;
  height: number;
  yLabel: string;
  yTicks: Tick[];
  /** Whether this panel shows x tick labels (the bottom panel does). */
  showXLabels: boolean;
  paths: PathLayout[];
  dots: Array<{ cx: number; cy: number; style: SeriesStyle; label: string }>;
  /** `type,d0,d1,r0,r1` for the client hover script. */
  yScaleAttr: string;
  clipId: string;
}

export interface PlotLayout {
  id: string;
  title: string;
  description: string;
  width: number;
  height: number;
  left: number;
  right: number;
  xLabel: string;
  xTicks: Tick[];
  xScaleAttr: string;
  /** Unit prefix multiplier of x values in the hover read-out. */
  xUnit: string;
  panels: PanelLayout[];
  markers: Array<{ x: number; label: string; top: number; bottom: number }>;
  links: Array<{ cx: number; cy: number; href: string; label: string; group: number; id?: string }>;
  legend: Array<{ label: string; style: SeriesStyle; x: number; group?: number }>;
}

const MARGIN = { left: 70, right: 18, top: 30, bottom: 44, gap: 14 };
const DEFAULT_WIDTH = 720;
const DEFAULT_HEIGHT = 380;

/** Engineering prefix for a magnitude as [scale, symbol]: 1.2e7 → [1e6, 'M'] (the shared SI table). */
export function prefixFor(abs: number): [number, string] {
  const p = siPrefixFor(abs);
  return [p.scale, p.symbol];
}

/** Decimals needed to tell ticks `step` apart when shown in units of `scale`. */
function decimalsFor(step: number, scale: number): number {
  const s = Math.abs(step / scale);
  if (!(s > 0)) return 0;
  return Math.max(0, Math.min(9, -Math.floor(Math.log10(s) + 1e-9)));
}

/** Format a number with a given number of decimals, using a proper minus sign. */
function fixed(v: number, decimals: number): string {
  const t = v.toFixed(decimals);
  return t.startsWith('-') && Number(t) !== 0 ? `−${t.slice(1)}` : t.replace(/^-/, '');
}

/** Short SI label of one value on a log axis: 1e3 → "1k", 2.2e-12 → "2.2p". */
export function siTickLabel(v: number): string {
  const [scale, prefix] = prefixFor(Math.abs(v));
  const m = Number((v / scale).toPrecision(3));
  return `${String(m).replace('-', '−')}${prefix}`;
}

function extent(values: number[], positiveOnly: boolean): [number, number] | undefined {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v) || (positiveOnly && v <= 0)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : undefined;
}

function padDomain([lo, hi]: [number, number], type: 'log' | 'linear', pad: number): [number, number] {
  if (type === 'log') {
    if (lo === hi) return [lo / 2, hi * 2];
    const r = Math.pow(hi / lo, pad);
    return [lo / r, hi * r];
  }
  if (lo === hi) {
    const d = Math.abs(lo) * 0.01 || 1;
    return [lo - d, hi + d];
  }
  const d = (hi - lo) * pad;
  return [lo - d, hi + d];
}

function makeScale(
  type: 'log' | 'linear',
  domain: [number, number],
  range: [number, number],
): ScaleContinuousNumeric<number, number> {
  return (type === 'log' ? scaleLog() : scaleLinear()).domain(domain).range(range);
}

/** Tick values: log axes keep 1-2-5 (or decades) so labels do not collide. */
function tickValues(scale: ScaleContinuousNumeric<number, number>, type: 'log' | 'linear', count: number): number[] {
  const ticks = scale.ticks(count);
  if (type === 'linear' || ticks.length <= count + 2) return ticks;
  const lead = (v: number) => Math.round(v / Math.pow(10, Math.floor(Math.log10(v) + 1e-9)));
  const oneTwoFive = ticks.filter((v) => [1, 2, 5].includes(lead(v)));
  return oneTwoFive.length <= count + 2 ? oneTwoFive : ticks.filter((v) => lead(v) === 1);
}

/** Axis label with its unit; linear axes share one prefix: ("Frequency", "Hz") → "Frequency (MHz)". */
function axisLabels(
  name: string,
  unit: string,
  type: 'log' | 'linear',
  values: number[],
  domain: [number, number],
): { label: string; labels: string[] } {
  if (type === 'log') {
    return { label: unit ? `${name} (${unit})` : name, labels: values.map(siTickLabel) };
  }
  const maxAbs = Math.max(Math.abs(domain[0]), Math.abs(domain[1]));
  const [scale, prefix] =
    unit && unit !== '%' && unit !== '°' && unit !== 'ppm' && unit !== '°C' ? prefixFor(maxAbs) : [1, ''];
  const step = values.length > 1 ? values[1] - values[0] : maxAbs;
  const decimals = decimalsFor(step, scale);
  const u = `${prefix}${unit}`;
  return { label: u ? `${name} (${u})` : name, labels: values.map((v) => fixed(v / scale, decimals)) };
}

/** Lay out a plot: scales, ticks, paths, markers and legend. */
export function layoutPlot(spec: PlotSpec): PlotLayout {
  const width = spec.width ?? DEFAULT_WIDTH;
  const height = spec.height ?? DEFAULT_HEIGHT;
  const left = MARGIN.left;
  const right = width - MARGIN.right;
  const allX = spec.panels
    .flatMap((p) => p.series.flatMap((s) => s.curve.x))
    .concat((spec.links ?? []).map((l) => l.x));
  const xExt = spec.xDomain ?? extent(allX, spec.xScale === 'log') ?? [1, 10];
  const xDomain = spec.xDomain ?? padDomain(xExt, spec.xScale, spec.links?.length ? 0.05 : 0);
  const x = makeScale(spec.xScale, xDomain, [left, right]);
  const xTickValues = tickValues(x, spec.xScale, Math.max(3, Math.floor((right - left) / 110)));
  const xAxis = axisLabels(spec.xName, spec.xUnit, spec.xScale, xTickValues, xDomain);
  const xTicks = xTickValues.map((v, i) => ({ pos: round1(x(v)), label: xAxis.labels[i] }));

  const totalWeight = spec.panels.reduce((s, p) => s + (p.weight ?? 1), 0);
  const plotHeight = height - MARGIN.top - MARGIN.bottom - MARGIN.gap * (spec.panels.length - 1);
  let top = MARGIN.top;
  const yScales: Array<ScaleContinuousNumeric<number, number>> = [];
  const panels: PanelLayout[] = spec.panels.map((p, pi) => {
    const h = (plotHeight * (p.weight ?? 1)) / totalWeight;
    const panelTop = top;
    top += h + MARGIN.gap;
    const yValues = p.series.flatMap((s) => s.curve.y).concat(pi === 0 ? (spec.links ?? []).map((l) => l.y) : []);
    const yExt = extent(yValues, p.yScale === 'log') ?? [1, 10];
    const yDomain = p.yDomain ?? padDomain(yExt, p.yScale, 0.06);
    const y = makeScale(p.yScale, yDomain, [panelTop + h, panelTop]);
    yScales.push(y);
    const yTickValues = p.yTicks ?? tickValues(y, p.yScale, Math.max(2, Math.floor(h / 40)));
    const yAxis = axisLabels(p.yName, p.yUnit, p.yScale, yTickValues, yDomain);
    const ok = (v: number, type: 'log' | 'linear') => Number.isFinite(v) && (type === 'linear' || v > 0);
    const gen = line<number>()
      .defined((i) => ok(pointsX[i], spec.xScale) && ok(pointsY[i], p.yScale))
      .x((i) => x(pointsX[i]))
      .y((i) => y(pointsY[i]))
      .digits(1);
    let pointsX: number[] = [];
    let pointsY: number[] = [];
    const paths: PathLayout[] = [];
    const dots: PanelLayout['dots'] = [];
    for (const s of p.series) {
      pointsX = s.curve.x;
      pointsY = s.curve.y;
      if (s.style === 'points') {
        s.curve.x.forEach((xv, i) => {
          if (ok(xv, spec.xScale) && ok(s.curve.y[i], p.yScale))
            dots.push({ cx: round1(x(xv)), cy: round1(y(s.curve.y[i])), style: s.style, label: s.label });
        });
        continue;
      }
      const d = gen(s.curve.x.map((_, i) => i)) ?? '';
      paths.push({ d, style: s.style, label: s.label });
    }
    return {
      top: round1(panelTop),
      height: round1(h),
      yLabel: yAxis.label,
      yTicks: yTickValues
        .map((v, i) => ({ pos: round1(y(v)), label: yAxis.labels[i] }))
        .filter((t) => t.pos >= panelTop - 0.5 && t.pos <= panelTop + h + 0.5),
      showXLabels: pi === spec.panels.length - 1,
      paths,
      dots,
      yScaleAttr: [p.yScale, yDomain[0], yDomain[1], round1(panelTop + h), round1(panelTop)].join(','),
      clipId: `${spec.id}-clip-${pi}`,
    };
  });
  const first = panels[0];
  const last = panels[panels.length - 1];
  const firstY = yScales[0];
  const markers = (spec.markers ?? [])
    .filter((m) => m.x >= Math.min(...xDomain) && m.x <= Math.max(...xDomain))
    .map((m) => ({ x: round1(x(m.x)), label: m.label, top: first.top, bottom: round1(last.top + last.height) }));
  const links = (spec.links ?? [])
    .filter(
      (l) =>
        Number.isFinite(l.x) &&
        Number.isFinite(l.y) &&
        (spec.xScale === 'linear' || l.x > 0) &&
        (spec.panels[0].yScale === 'linear' || l.y > 0),
    )
    .map((l) => ({
      cx: round1(x(l.x)),
      cy: round1(firstY(l.y)),
      href: l.href,
      label: l.label,
      group: l.group ?? 0,
      id: l.id,
    }));
  const seen = new Set<string>();
  let lx = left;
  const legend: PlotLayout['legend'] = [];
  for (const p of spec.panels) {
    for (const s of p.series) {
      const key = `${s.style}|${s.label}`;
      if (seen.has(key)) continue;
      seen.add(key);
      legend.push({ label: s.label, style: s.style, x: lx });
      lx += 44 + s.label.length * 7.4;
    }
  }
  const usedGroups = new Set(links.map((l) => l.group));
  (spec.groupLabels ?? []).forEach((label, group) => {
    if (!usedGroups.has(group)) return;
    legend.push({ label, style: 'points', x: lx, group });
    lx += 30 + label.length * 7.4;
  });
  return {
    id: spec.id,
    title: spec.title,
    description: spec.description,
    width,
    height,
    left,
    right,
    xLabel: xAxis.label,
    xTicks,
    xScaleAttr: [spec.xScale, xDomain[0], xDomain[1], left, right].join(','),
    xUnit: spec.xUnit,
    panels,
    markers,
    links,
    legend,
  };
}

function round1(v: number): number {
  return Math.round(v * 10) / 10;
}
