import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseOscillatorsYaml } from '../../../src/lib/osc/oscillators-yaml.ts';

const GOOD = `circuits:
  - name: bench-pierce
    gm: 5 mA/V
    inputCapacitance: 3 pF
    outputCapacitance: 3 pF
    boardStray: 2 pF
    boardStrayUncertainty: 0.5 pF
    supply: 3.3 V
    capacitorTolerance: 5 %
    series: E12
`;

/** GOOD with one line replaced (1-based line number). */
function withLine(n: number, text: string): string {
  const lines = GOOD.split('\n');
  lines[n - 1] = text;
  return lines.join('\n');
}

describe('parseOscillatorsYaml', () => {
  it('reads a circuit into SI values', () => {
    const { circuits, issues } = parseOscillatorsYaml(GOOD, 'osc.yaml');
    expect(issues).toEqual([]);
    expect(circuits).toHaveLength(1);
    const c = circuits[0];
    expect(c.gmS).toBeCloseTo(5e-3, 15);
    expect(c.inputCapacitanceF).toBeCloseTo(3e-12, 24);
    expect(c.boardStrayUncertaintyF).toBeCloseTo(0.5e-12, 24);
    expect(c.pinToPinStrayF).toBe(0);
    expect(c.supplyV).toBe(3.3);
    expect(c.capacitorToleranceFraction).toBeCloseTo(0.05, 15);
    expect(c.series).toBe('E12');
  });

  it('accepts gm in mS as well as mA/V', () => {
    const { circuits } = parseOscillatorsYaml(withLine(3, '    gm: 5 mS'), 'osc.yaml');
    expect(circuits[0].gmS).toBeCloseTo(5e-3, 15);
  });

  it('reports a negative capacitance at its line and field', () => {
    const { circuits, issues } = parseOscillatorsYaml(withLine(5, '    outputCapacitance: -3 pF'), 'osc.yaml');
    expect(circuits).toEqual([]);
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({
      severity: 'error',
      file: 'osc.yaml',
      line: 5,
      path: 'circuits[0].outputCapacitance',
    });
    expect(issues[0].message).toBe('expected a non-negative capacitance, got "-3 pF"');
  });

  it('reports a transconductance given in the wrong unit at its line', () => {
    const { issues } = parseOscillatorsYaml(withLine(3, '    gm: 5 pF'), 'osc.yaml');
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ line: 3, col: 9, path: 'circuits[0].gm' });
    expect(issues[0].message).toBe(
      'expected a transconductance such as "5 mA/V" or "5 mS", got "5 pF" (a capacitance)',
    );
  });

  it('collects every problem of a file, each located', () => {
    const text = `${withLine(8, '    supply: 3.3 A').replace('series: E12', 'series: E48')}  - name: second
    gm: fast
`;
    const { circuits, issues } = parseOscillatorsYaml(text, 'osc.yaml');
    expect(circuits).toEqual([]);
    const lines = issues.map((i) => `${i.line} ${i.path}: ${i.message}`);
    expect(lines).toContain('8 circuits[0].supply: expected a voltage such as "3.3 V", got "3.3 A" (a current)');
    expect(lines).toContain('10 circuits[0].series: expected one of E6, E12, E24');
    expect(lines).toContain('12 circuits[1].gm: expected a transconductance such as "5 mA/V" or "5 mS", got "fast"');
    expect(lines).toContain('11 circuits[1].inputCapacitance: missing required field "inputCapacitance"');
    expect(lines).toContain('11 circuits[1].series: missing required field "series"');
  });

  it('rejects a tolerance above 50 % and warns on an unknown key', () => {
    const text = withLine(9, '    capacitorTolerance: 60 %\n    colour: blue');
    const { issues } = parseOscillatorsYaml(text, 'osc.yaml');
    expect(issues.find((i) => i.path === 'circuits[0].capacitorTolerance')?.message).toBe(
      'expected a tolerance between 0 and 50 % such as "5 %", got "60 %"',
    );
    expect(issues.find((i) => i.path === 'circuits[0].colour')).toMatchObject({ severity: 'warning', line: 10 });
  });

  it('rejects duplicate circuit names, naming the first', () => {
    const text = GOOD + GOOD.replace('circuits:\n', '');
    const { circuits, issues } = parseOscillatorsYaml(text, 'osc.yaml');
    expect(circuits).toHaveLength(1);
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({
      line: 11,
      path: 'circuits[1].name',
      message: 'duplicate circuit name "bench-pierce" (also circuits[0])',
    });
  });

  it('reports YAML syntax errors with their line and no circuits', () => {
    const { circuits, issues } = parseOscillatorsYaml('circuits:\n  - name: a\n   gm: [1\n', 'osc.yaml');
    expect(circuits).toEqual([]);
    expect(issues.length).toBeGreaterThan(0);
    expect(issues[0].line).toBeGreaterThanOrEqual(2);
    expect(issues[0].message).toMatch(/^yaml: /);
  });

  it('asks for a circuits list when the file has none', () => {
    const { issues } = parseOscillatorsYaml('- name: a\n', 'osc.yaml');
    expect(issues[0].message).toBe('expected a top-level "circuits:" list');
  });

  it('reads the demo content/oscillators.yaml without a single issue', () => {
    const { circuits, issues } = parseOscillatorsYaml(
      readFileSync('content/oscillators.yaml', 'utf8'),
      'content/oscillators.yaml',
    );
    expect(issues).toEqual([]);
    expect(circuits.map((c) => c.name)).toEqual([
      'sensor-hub-pierce',
      'radio-ref-pierce',
      'rtc-lowpower-pierce',
      'legacy-board-pierce',
    ]);
    const rtc = circuits[2];
    expect(rtc.gmS).toBeCloseTo(25e-6, 18);
    expect(rtc.frequencyRangeHz).toEqual({ min: 30e3, max: 40e3 });
  });
});
