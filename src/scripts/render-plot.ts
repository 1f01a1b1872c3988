/**
 * Client-side twin of src/components/Plot.astro: a PlotLayout as SVG DOM nodes with an HTML
 * legend (compare page).
 * Text goes in with textContent only.
 */
import type { PlotLayout } from '../site/plot.ts';

const NS = 'http://www.w3.org/2000/svg';

function svgEl(name: string, attrs: Record<string, string | number | undefined>, text?: string): SVGElement {
  const el = document.createElementNS(NS, name);
  for (const [k, v] of Object.entries(attrs)) if (v !== undefined) el.setAttribute(k, String(v));
  if (text !== undefined) el.textContent = text;
  return el;
}

/** Build a <figure> holding the plot. */
export function renderPlot(plot: PlotLayout): HTMLElement {
  const fig = document.createElement('figure');
  fig.className = 'plot';
  const cap = document.createElement('figcaption');
  cap.id = `${plot.id}-title`;
  cap.textContent = plot.title;
  fig.appendChild(cap);
  if (plot.legend.length) {
    const ul = document.createElement('ul');
    ul.className = 'plot-legend';
    for (const l of plot.legend) {
      const li = document.createElement('li');
      const sw = svgEl('svg', { class: 'swatch', viewBox: '0 0 28 12', 'aria-hidden': 'true' });
      sw.appendChild(svgEl('line', { x1: 1, x2: 27, y1: 6, y2: 6, class: `s-${l.style}` }));
      li.appendChild(sw);
      li.appendChild(document.createTextNode(l.label));
      ul.appendChild(li);
    }
    fig.appendChild(ul);
  }
  const svg = svgEl('svg', {
    viewBox: `0 0 ${plot.width} ${plot.height}`,
    role: 'img',
    'aria-labelledby': cap.id,
    'aria-describedby': `${plot.id}-desc`,
    tabindex: 0,
    'data-x': plot.xScaleAttr,
    'data-xunit': plot.xUnit,
    'data-xname': plot.xLabel,
    class: 'plot-svg',
  });
  svg.appendChild(svgEl('title', {}, plot.title));
  svg.appendChild(svgEl('desc', { id: `${plot.id}-desc` }, plot.description));
  for (const p of plot.panels) {
    const g = svgEl('g', { class: 'panel', 'data-y': p.yScaleAttr, 'data-yname': p.yLabel });
    const clip = svgEl('clipPath', { id: p.clipId });
    clip.appendChild(svgEl('rect', { x: plot.left, y: p.top, width: plot.right - plot.left, height: p.height }));
    g.appendChild(clip);
    g.appendChild(
      svgEl('rect', { class: 'frame', x: plot.left, y: p.top, width: plot.right - plot.left, height: p.height }),
    );
    for (const t of plot.xTicks)
      g.appendChild(svgEl('line', { class: 'grid', x1: t.pos, x2: t.pos, y1: p.top, y2: p.top + p.height }));
    for (const t of p.yTicks) {
      g.appendChild(svgEl('line', { class: 'grid', x1: plot.left, x2: plot.right, y1: t.pos, y2: t.pos }));
      g.appendChild(svgEl('text', { class: 'tick', x: plot.left - 6, y: t.pos + 4, 'text-anchor': 'end' }, t.label));
    }
    g.appendChild(
      svgEl(
        'text',
        {
          class: 'axis-label',
          transform: `translate(16,${p.top + p.height / 2}) rotate(-90)`,
          'text-anchor': 'middle',
        },
        p.yLabel,
      ),
    );
    const body = svgEl('g', { 'clip-path': `url(#${p.clipId})` });
    for (const s of p.paths) body.appendChild(svgEl('path', { d: s.d, class: `s-${s.style}`, 'data-label': s.label }));
    g.appendChild(body);
    if (p.showXLabels) {
      for (const t of plot.xTicks)
        g.appendChild(
          svgEl('text', { class: 'tick', x: t.pos, y: p.top + p.height + 16, 'text-anchor': 'middle' }, t.label),
        );
      g.appendChild(
        svgEl(
          'text',
          { class: 'axis-label', x: (plot.left + plot.right) / 2, y: p.top + p.height + 36, 'text-anchor': 'middle' },
          plot.xLabel,
        ),
      );
    }
    svg.appendChild(g);
  }
  for (const m of plot.markers) {
    const g = svgEl('g', { class: 'marker' });
    g.appendChild(svgEl('line', { x1: m.x, x2: m.x, y1: m.top, y2: m.bottom }));
    g.appendChild(svgEl('text', { x: m.x + 3, y: m.top + 12 }, m.label));
    svg.appendChild(g);
  }
  const cursor = svgEl('g', { class: 'cursor', 'aria-hidden': 'true' });
  cursor.appendChild(svgEl('line', { class: 'cursor-line', x1: 0, x2: 0, y1: 0, y2: 0 }));
  svg.appendChild(cursor);
  fig.appendChild(svg);
  const out = document.createElement('output');
  out.className = 'readout';
  out.setAttribute('aria-live', 'polite');
  fig.appendChild(out);
  return fig;
}
