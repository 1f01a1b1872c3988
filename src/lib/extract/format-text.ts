/**
 * Readable text form of an extraction result (what `motional extract PART` prints without
 * --json): per sample, C0, one table row per mode, the cross-check verdicts, conditions and
 * warnings. Numbers with engineering prefixes; a value with its standard uncertainty in the
 * GUM's concise form, both rounded together (src/lib/units/measured.ts): "25.79883(96) Ω".
 */
import type { CrossCheck, ModeResult, PartResult, SampleResult } from './types.ts';
import { formatSi } from '../units/si.ts';
import { formatMeasured } from '../units/measured.ts';
import { modeLabel } from '../models/mode-label.ts';

function pm(value: number, u: number, unit: string, digits = 6): string {
  return formatMeasured(value, u, unit, { fallbackDigits: digits });
}

/** A frequency in Hz (no prefix, so a column of them lines up) with its uncertainty. */
function hzPm(value: number, u: number): string {
  return formatMeasured(value, u, 'Hz', { prefixed: false, fallbackDigits: 12 });
}

function hz(value: number): string {
  return `${value.toFixed(value >= 1e6 ? 3 : 4)} Hz`;
}

function pad(s: string, n: number): string {
  return s.length >= n ? s : s + ' '.repeat(n - s.length);
}

function verdicts(list: CrossCheck[]): string {
  return list
    .map((c) => `${c.quantity} ${c.verdict}${c.verdict === 'single' ? '' : ` (${c.values.length})`}`)
    .join(', ');
}

function table(rows: string[][]): string[] {
  const widths = rows[0].map((_, j) => Math.max(...rows.map((r) => r[j].length)));
  return rows.map((r) =>
    r
      .map((c, j) => pad(c, widths[j]))
      .join('  ')
      .trimEnd(),
  );
}

function sampleText(s: SampleResult): string[] {
  const out: string[] = [];
  const cond = [
    s.temperatureC !== undefined ? `${s.temperatureC} °C` : undefined,
    s.driveW !== undefined ? formatSi(s.driveW, 'W', 3) : undefined,
  ]
    .filter(Boolean)
    .join(', ');
  out.push(`sample ${s.sample}${cond ? ` (reference: ${cond})` : ''}`);
  if (s.modes.length === 0) {
    out.push('  no modes extracted');
  } else {
    out.push(`  C0 ${pm(s.c0F, s.modes[0].uncertainty.c0F, 'F', 5)}   [${verdicts([s.c0CrossCheck])}]`);
    const rows: string[][] = [['  mode', 'fs', 'fp', 'R1', 'L1', 'C1', 'Q', 'M', 'note']];
    for (const m of s.modes) {
      const notes: string[] = [];
      if (m.spurious && m.strengthDb !== undefined)
        notes.push(`${m.strengthDb.toFixed(1)} dB (R ratio ${m.resistanceRatio!.toFixed(2)})`);
      if (m.flagged) notes.push('FLAGGED: above instrument range');
      rows.push([
        `  ${modeLabel(m)}`,
        hzPm(m.fsHz, m.uncertainty.fsHz),
        hzPm(m.fpHz, m.uncertainty.fpHz),
        pm(m.r1Ohm, m.uncertainty.r1Ohm, 'Ω', 5),
        pm(m.l1H, m.uncertainty.l1H, 'H', 6),
        pm(m.c1F, m.uncertainty.c1F, 'F', 6),
        m.q.toFixed(0),
        m.m.toPrecision(3),
        notes.join('; '),
      ]);
    }
    out.push(...table(rows));
    out.push('  cross-checks:');
    for (const m of s.modes) out.push(`    ${modeLabel(m)} at ${formatSi(m.fsHz, 'Hz', 8)}: ${verdicts(m.crossCheck)}`);
  }
  out.push(
    `  fit: ${s.fit.converged ? 'converged' : 'not converged'} (${s.fit.reason}), ${s.fit.points} points, rms residual ${s.fit.rmsResidual.toExponential(2)}`,
  );
  if (s.temperature) {
    const t = s.temperature;
    out.push(
      `  temperature (${t.form}): turnover ${t.turnoverC.map((x) => `${x.toFixed(1)} °C`).join(', ') || 'none'}; span ${t.spanPpm.toFixed(2)} ppm over ${t.spanRangeC.min}…${t.spanRangeC.max} °C`,
    );
  }
  if (s.drive)
    out.push(
      `  drive level: R1 max/min ${s.drive.resistanceRatio.toFixed(3)}, frequency shift ${s.drive.frequencyShiftPpm.toFixed(3)} ppm over ${s.drive.points.length} levels`,
    );
  for (const o of s.otherConditions) {
    const c = [
      o.temperatureC !== undefined ? `${o.temperatureC} °C` : '',
      o.driveW !== undefined ? formatSi(o.driveW, 'W', 3) : '',
    ]
      .filter(Boolean)
      .join(', ');
    out.push(`  at ${c || 'other conditions'} (${o.sweep}): fs ${hz(o.fsHz)}, R1 ${formatSi(o.r1Ohm, 'Ω', 5)}`);
  }
  if (s.warnings.length) {
    out.push('  warnings:');
    for (const w of s.warnings) out.push(`    - ${w}`);
  }
  return out;
}

/** The whole result as lines of text (ends with a newline). */
export function formatExtractText(result: PartResult): string {
  const lines = [`part ${result.part}`];
  for (const s of result.samples) lines.push('', ...sampleText(s));
  return `${lines.join('\n')}\n`;
}
