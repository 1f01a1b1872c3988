/**
 * Hover (and keyboard) read-outs on the build-time SVG plots. Each plot carries its scales as
 * `data-x` / `data-y` = "type,d0,d1,r0,r1"; the curves are read back from their path strings,
 * so no data is shipped twice. Arrow keys move the cursor when the plot has focus.
 */
import { formatSi } from '../lib/units/si.ts';

interface Axis {
  log: boolean;
  d0: number;
  d1: number;
  r0: number;
  r1: number;
}

function parseAxis(attr: string | null): Axis | undefined {
  if (!attr) return undefined;
  const [type, ...nums] = attr.split(',');
  const [d0, d1, r0, r1] = nums.map(Number);
  return [d0, d1, r0, r1].every(Number.isFinite) ? { log: type === 'log', d0, d1, r0, r1 } : undefined;
}

function invert(a: Axis, px: number): number {
  const t = (px - a.r0) / (a.r1 - a.r0);
  return a.log ? Math.exp(Math.log(a.d0) + t * (Math.log(a.d1) - Math.log(a.d0))) : a.d0 + t * (a.d1 - a.d0);
}

/** Points of a path "M x,yLx,y…" as separate runs (gaps start a new run). */
function parsePath(d: string): Array<Array<[number, number]>> {
  const runs: Array<Array<[number, number]>> = [];
  for (const m of d.matchAll(/([ML])\s*(-?[\d.]+(?:e-?\d+)?)[ ,](-?[\d.]+(?:e-?\d+)?)/g)) {
    if (m[1] === 'M' || runs.length === 0) runs.push([]);
    runs[runs.length - 1].push([Number(m[2]), Number(m[3])]);
  }
  return runs;
}

function yAt(runs: Array<Array<[number, number]>>, px: number): number | undefined {
  for (const run of runs) {
    if (run.length < 2 || px < run[0][0] || px > run[run.length - 1][0]) continue;
    let lo = 0;
    let hi = run.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (run[mid][0] <= px) lo = mid;
      else hi = mid;
    }
    const [x0, y0] = run[lo];
    const [x1, y1] = run[hi];
    return x1 === x0 ? y0 : y0 + ((px - x0) / (x1 - x0)) * (y1 - y0);
  }
  return undefined;
}

/** "Frequency (MHz)" → ["Frequency", "Hz"]-style split, keeping the base unit for formatSi. */
function nameAndUnit(label: string, fallbackUnit: string): [string, string] {
  const m = /^(.*?)\s*\(([^)]*)\)$/.exec(label);
  if (!m) return [label, fallbackUnit];
  return [m[1], fallbackUnit || m[2]];
}

function format(v: number, unit: string): string {
  if (unit === '°' || unit === '%' || unit === 'ppm' || unit === '°C' || unit === '')
    return `${Number(v.toPrecision(4))} ${unit}`.trim();
  return formatSi(v, unit, unit === 'Hz' ? 9 : 4);
}

function setup(svg: SVGSVGElement): void {
  const xAxis = parseAxis(svg.getAttribute('data-x'));
  const output = svg.parentElement?.querySelector('output.readout');
  const cursor = svg.querySelector<SVGLineElement>('line.cursor-line');
  if (!xAxis || !output || !cursor) return;
  const xUnit = svg.getAttribute('data-xunit') ?? '';
  const [xName] = nameAndUnit(svg.getAttribute('data-xname') ?? '', xUnit);
  const panels = Array.from(svg.querySelectorAll<SVGGElement>('g.panel')).map((g) => {
    const axis = parseAxis(g.getAttribute('data-y'));
    const [name, unitGuess] = nameAndUnit(g.getAttribute('data-yname') ?? '', '');
    const unit = unitGuess.replace(/^[kMGmµnpf]?(Ω|F|H|Hz|W)$/, '$1');
    const paths = Array.from(g.querySelectorAll<SVGPathElement>('path[data-label]')).map((p) => ({
      label: p.dataset.label ?? '',
      runs: parsePath(p.getAttribute('d') ?? ''),
    }));
    return { axis, name, unit, paths };
  });
  const top = Math.min(...panels.map((p) => Math.min(p.axis?.r0 ?? 0, p.axis?.r1 ?? 0)));
  const bottom = Math.max(...panels.map((p) => Math.max(p.axis?.r0 ?? 0, p.axis?.r1 ?? 0)));
  let px = (xAxis.r0 + xAxis.r1) / 2;

  function show(): void {
    px = Math.min(Math.max(px, xAxis!.r0), xAxis!.r1);
    cursor!.setAttribute('x1', String(px));
    cursor!.setAttribute('x2', String(px));
    cursor!.setAttribute('y1', String(top));
    cursor!.setAttribute('y2', String(bottom));
    svg.classList.add('has-cursor');
    const parts = [`${xName} ${format(invert(xAxis!, px), xUnit)}`];
    for (const p of panels) {
      if (!p.axis) continue;
      const vals = p.paths
        .map((s) => ({ label: s.label, y: yAt(s.runs, px) }))
        .filter((v): v is { label: string; y: number } => v.y !== undefined)
        .map((v) => `${v.label} ${format(invert(p.axis!, v.y), p.unit)}`);
      if (vals.length) parts.push(`${p.name}: ${vals.join(', ')}`);
    }
    output!.textContent = parts.join(' · ');
  }

  svg.addEventListener('pointermove', (ev) => {
    const ctm = svg.getScreenCTM();
    if (!ctm) return;
    const pt = new DOMPoint(ev.clientX, ev.clientY).matrixTransform(ctm.inverse());
    px = pt.x;
    show();
  });
  svg.addEventListener('pointerleave', () => svg.classList.remove('has-cursor'));
  svg.addEventListener('focus', show);
  svg.addEventListener('blur', () => svg.classList.remove('has-cursor'));
  svg.addEventListener('keydown', (ev) => {
    const step = ((xAxis.r1 - xAxis.r0) / 100) * (ev.shiftKey ? 10 : 1);
    if (ev.key === 'ArrowRight') px += step;
    else if (ev.key === 'ArrowLeft') px -= step;
    else if (ev.key === 'Home') px = xAxis.r0;
    else if (ev.key === 'End') px = xAxis.r1;
    else return;
    ev.preventDefault();
    show();
  });
}

/** Attach read-outs to every plot on the page (also plots added later, via `attachPlotHover`). */
export function attachPlotHover(root: ParentNode = document): void {
  root.querySelectorAll<SVGSVGElement>('svg.plot-svg:not([data-hover])').forEach((svg) => {
    svg.setAttribute('data-hover', '');
    setup(svg);
  });
}

attachPlotHover();
