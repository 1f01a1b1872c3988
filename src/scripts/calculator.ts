/**
 * Part page calculator: reads the form, runs the same advice code as the `advise` command
 * (src/site/calculator.ts → src/lib/osc/pierce.ts) and prints the result rows.
 */
import { formFromCircuit, runCalculator, type CalculatorForm } from '../site/calculator.ts';
import type { CalculatorData } from '../site/types.ts';

const form = document.getElementById('calc-form') as HTMLFormElement | null;
const out = document.getElementById('calc-result');

const FIELDS: Array<keyof CalculatorForm> = ['circuit', 'target', 'stray', 'pinIn', 'pinOut', 'pinToPin', 'gm'];

function el(name: keyof CalculatorForm): HTMLInputElement | HTMLSelectElement {
  return form!.elements.namedItem(name) as HTMLInputElement | HTMLSelectElement;
}

function read(): CalculatorForm {
  const f = {} as CalculatorForm;
  for (const k of FIELDS) f[k] = el(k).value;
  return f;
}

function fill(values: CalculatorForm): void {
  for (const k of FIELDS) el(k).value = values[k];
}

function render(data: CalculatorData): void {
  const result = runCalculator(data, read());
  out!.replaceChildren();
  for (const k of FIELDS) {
    const input = el(k);
    if (!result.ok && result.field === k) {
      input.setAttribute('aria-invalid', 'true');
      input.setAttribute('aria-describedby', 'calc-error');
    } else {
      input.removeAttribute('aria-invalid');
      input.removeAttribute('aria-describedby');
    }
  }
  if (!result.ok) {
    const p = document.createElement('p');
    p.className = 'field-error';
    p.id = 'calc-error';
    p.textContent = result.message;
    out!.appendChild(p);
    return;
  }
  const table = document.createElement('table');
  table.className = 'data rows';
  table.id = 'calc-table';
  const caption = table.createCaption();
  caption.textContent = `Result for ${result.advice.circuit}`;
  const body = table.createTBody();
  for (const r of result.rows) {
    const tr = body.insertRow();
    const th = document.createElement('th');
    th.scope = 'row';
    th.textContent = r.label;
    tr.appendChild(th);
    const td = tr.insertCell();
    td.className = r.state ? `num state-cell state-${r.state}` : 'num';
    td.textContent = r.value;
  }
  out!.appendChild(table);
}

if (form && out && form.dataset.calc) {
  const data = JSON.parse(form.dataset.calc) as CalculatorData;
  const first = data.circuits[0];
  if (first) {
    fill(formFromCircuit(data, first));
    render(data);
    el('circuit').addEventListener('change', () => {
      const c = data.circuits.find((x) => x.name === el('circuit').value) ?? first;
      fill({ ...formFromCircuit(data, c), target: el('target').value });
      render(data);
    });
    form.addEventListener('input', (ev) => {
      if ((ev.target as HTMLElement).id !== 'c-circuit') render(data);
    });
    form.addEventListener('submit', (ev) => {
      ev.preventDefault();
      render(data);
    });
    form.dataset.ready = 'true';
  }
}
