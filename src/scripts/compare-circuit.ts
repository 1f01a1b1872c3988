/**
 * Compare page: the negative-resistance curves of the chosen parts in one circuit, overlaid,
 * with a circuit selector kept in the URL (`circuit=NAME`).
 */
import { layoutPlot } from '../site/plot.ts';
import { compareCircuits, compareNegativeResistanceSpec } from '../site/pierce-design.ts';
import type { CompareData } from '../site/types.ts';
import { renderPlot } from './render-plot.ts';
import { attachPlotHover } from './plot-hover.ts';

/** The circuit asked for in the address when the page opened (the page canonicalises its query). */
const INITIAL_CIRCUIT = new URLSearchParams(location.search).get('circuit');

/** Append the circuit selector and the overlaid curves to `out`. */
export function appendCircuitOverlay(out: HTMLElement, parts: CompareData[]): void {
  const circuits = compareCircuits(parts);
  if (!circuits.length) return;
  const section = document.createElement('section');
  section.className = 'compare-circuit';
  section.setAttribute('aria-labelledby', 'cmp-circuit-h');
  const h = document.createElement('h2');
  h.id = 'cmp-circuit-h';
  h.textContent = 'Negative resistance in a circuit';
  const label = document.createElement('label');
  label.htmlFor = 'cmp-circuit';
  label.textContent = 'Circuit ';
  const select = document.createElement('select');
  select.id = 'cmp-circuit';
  for (const c of circuits) select.add(new Option(c, c));
  if (INITIAL_CIRCUIT && circuits.includes(INITIAL_CIRCUIT)) select.value = INITIAL_CIRCUIT;
  label.appendChild(select);
  const note = document.createElement('p');
  note.className = 'help';
  note.textContent =
    'Small-signal estimates from each part’s extracted model; a part starts where its curve lies above its R1. Confirm on the real board.';
  const plotBox = document.createElement('div');
  section.append(h, label, note, plotBox);
  out.appendChild(section);
  const draw = () => {
    const spec = compareNegativeResistanceSpec(parts, select.value, 'cmp-nr');
    plotBox.replaceChildren(...(spec ? [renderPlot(layoutPlot(spec))] : []));
    attachPlotHover(plotBox);
    const q = new URLSearchParams(location.search);
    q.set('circuit', select.value);
    history.replaceState(null, '', `${location.pathname}?${q.toString().replace(/%2C/g, ',')}`);
  };
  select.addEventListener('change', draw);
  draw();
}
