/**
 * Pick parts to compare from the catalogue table: a checkbox per row, up to
 * {@link MAX_COMPARE}, then Compare opens the compare page with them (`compare/?parts=a,b`).
 * The boxes and the button are shown only with JavaScript (`needs-js`).
 */
import { MAX_COMPARE } from '../site/compare.ts';

const table = document.getElementById('catalogue-table');
const button = document.getElementById('compare-picked') as HTMLButtonElement | null;
const status = document.getElementById('compare-picked-status');

function boxes(): HTMLInputElement[] {
  return Array.from(table?.querySelectorAll<HTMLInputElement>('input.pick') ?? []);
}

function update(): void {
  const picked = boxes().filter((b) => b.checked);
  for (const b of boxes()) b.disabled = !b.checked && picked.length >= MAX_COMPARE;
  if (button) {
    button.disabled = picked.length < 2;
    button.textContent = `Compare ${picked.length} part${picked.length === 1 ? '' : 's'}`;
  }
  if (status)
    status.textContent =
      picked.length >= MAX_COMPARE
        ? `${MAX_COMPARE} parts picked, the most a comparison shows`
        : picked.length < 2
          ? 'Pick two to four parts'
          : '';
}

if (table && button) {
  table.addEventListener('change', (e) => {
    if ((e.target as HTMLElement).classList.contains('pick')) update();
  });
  button.addEventListener('click', () => {
    const ids = boxes()
      .filter((b) => b.checked)
      .map((b) => encodeURIComponent(b.value));
    if (ids.length >= 2) location.href = `${document.body.dataset.base ?? '/'}compare/?parts=${ids.join(',')}`;
  });
  update();
}
