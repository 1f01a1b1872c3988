/**
 * View model of a part page: PartData turned into the rows, labels and plot layouts the
 * components print. Everything here is text or numbers; components compute nothing.
 */
import type { CrossCheck, Diagnostic, MethodName, ModeResult } from '../lib/extract/types.ts';
import type { CapacitorPair } from '../lib/osc/pierce.ts';
import { layoutPlot, type PlotLayout } from './plot.ts';
import { modePlotSpec, pullingPlotSpec, temperaturePlotSpec, widePlotSpec } from './part-plots.ts';
import {
  formatBytes,
  formatHz,
  formatNumber,
  formatPpm,
  formatQty,
  formatWithUncertainty,
  KIND_LABEL,
  STATE_LABEL,
  DISPLAY_DIGITS,
} from './format.ts';
import { renderMarkdown } from './markdown.ts';
import { modeLabel, overtoneLabel } from '../lib/models/mode-label.ts';
import type { PartData, SampleData } from './types.ts';
import { pierceDesignView, type PierceDesignView } from './pierce-design.ts';
import { tableView, type Column, type TableView } from './table-view.ts';

export interface Row {
  label: string;
  value: string;
  /** Raw SI value for machine reading (data-si attribute). */
  si?: number;
  state?: 'pass' | 'fail' | 'unknown' | 'warn' | 'warning';
  note?: string;
}

export interface CrossCheckView {
  quantity: string;
  verdict: string;
  verdictClass: 'pass' | 'fail' | 'unknown';
  rule: string;
  message?: string;
  values: Array<{ method: string; value: string; note?: string }>;
}

export interface SampleView {
  id: string;
  anchor: string;
  ok: boolean;
  provenance: Row[];
  sweeps: TableView;
  compensation?: string;
  /** Parameters of every mode with standard uncertainties, one row per mode. */
  modes: TableView;
  c0: string;
  fit?: string;
  crossChecks: Array<{ mode: string; checks: CrossCheckView[] }>;
  warnings: string[];
  diagnostics: Array<{ severity: string; text: string }>;
  drive?: { table: TableView; summary: string };
  otherConditions?: TableView;
  temperatureSummary?: string;
  plots: PlotLayout[];
}

export interface PierceView {
  circuit: string;
  ok: boolean;
  reason?: string;
  target?: string;
  pairs: Array<{ title: string; rows: Row[] }>;
  checks: Array<{ label: string; verdict: 'pass' | 'warn' | 'fail'; reason: string }>;
  assumptions: string[];
  /** Negative-resistance curve, start-up and frequency budget (pierce-design.ts). */
  design: PierceDesignView;
}

export interface PartView {
  id: string;
  title: string;
  subtitle: string;
  synthetic: boolean;
  notesHtml?: string;
  state: string;
  stateClass: string;
  summary: Row[];
  datasheet: Row[];
  compliance: Array<{
    sample: string;
    basis?: string;
    rule: string;
    items: Row[];
    cells: Array<{ text: string; state: string; title: string; label: string }>;
  }>;
  complianceHeaders: string[];
  samples: SampleView[];
  lotStats?: { n: number; rule: string; table: TableView; notes: string[] };
  pierce: PierceView[];
  cautions: string[];
  downloads: Array<{ href: string; label: string; name: string; size: string }>;
  recordWarnings: string[];
}

/** The cautions every part page shows (as in README: Cautions). */
export const PART_CAUTIONS: readonly string[] = [
  'The parameters describe one sample at one drive level, temperature and fixture. They are not a specification and do not replace the crystal maker’s data or the qualification of the part.',
  'Never use a circuit that exceeds the maker’s maximum drive level. Drive estimates state their assumptions (R1 or RL, voltage across the crystal or at a pin). Tuning forks and small SMD blanks are damaged by µW-level overdrive; units with drive-level dependence may not start at low drive.',
  'Load-capacitor advice depends on stray capacitance that only a measurement on the board settles. Confirm frequency, start-up and negative-resistance margin on the real board over temperature and supply.',
  'Transconductance and negative-resistance margins are small-signal figures; oscillator ICs vary with process, voltage and temperature. Use the IC maker’s limits where they are given.',
  'The BVD and SPICE models are narrow-band and linear: spurious modes, drive-level dependence, aging and temperature are absent unless modelled. Fits with low M (< 4), r below the physical minimum or implausible Q·f are flagged.',
  'Frequency accuracy for regulated radio bands and protocols is the product designer’s responsibility: these numbers are engineering estimates, not compliance evidence.',
];

const QUANTITY_LABEL: Record<CrossCheck['quantity'], [string, string]> = {
  fsHz: ['fs', 'Hz'],
  r1Ohm: ['R1', 'Ω'],
  c1F: ['C1', 'F'],
  l1H: ['L1', 'H'],
  c0F: ['C0', 'F'],
  q: ['Q', ''],
};

const METHOD_LABEL: Record<MethodName, string> = {
  'complex-fit': 'complex least squares, one sweep',
  'joint-fit': 'joint least squares, all sweeps',
  'closed-form': 'closed form from fs, fp and C0',
  'half-power': 'half-power bandwidth',
  'conductance-peak': 'conductance peak',
  'load-shift': 'shift with a known load',
  'two-load': 'two known loads',
  'capacitive-region': 'capacitive region',
  'zero-phase': 'zero-phase points',
};

function valueOf(q: CrossCheck['quantity'], v: number): string {
  const [, unit] = QUANTITY_LABEL[q];
  if (q === 'q') return formatNumber(v, 5);
  return formatQty(v, unit, q === 'fsHz' ? 10 : 5);
}

function crossCheckView(c: CrossCheck): CrossCheckView {
  const [name] = QUANTITY_LABEL[c.quantity];
  return {
    quantity: name,
    verdict:
      c.verdict === 'agree' ? 'methods agree' : c.verdict === 'disagree' ? 'methods disagree' : 'one method only',
    verdictClass: c.verdict === 'agree' ? 'pass' : c.verdict === 'disagree' ? 'fail' : 'unknown',
    rule: c.rule,
    message: c.message,
    values: c.values.map((v) => ({
      method: METHOD_LABEL[v.method],
      value:
        v.uncertainty !== undefined
          ? formatWithUncertainty(v.value, v.uncertainty, QUANTITY_LABEL[c.quantity][1])
          : valueOf(c.quantity, v.value),
      note: v.note,
    })),
  };
}

/** The parameters table: header and cell of each column together. */
const MODE_COLUMNS: ReadonlyArray<Column<ModeResult>> = [
  { header: 'fs', cell: (m) => formatWithUncertainty(m.fsHz, m.uncertainty.fsHz, 'Hz', 9) },
  { header: 'fp', cell: (m) => formatWithUncertainty(m.fpHz, m.uncertainty.fpHz, 'Hz', 9) },
  { header: 'R1', cell: (m) => formatWithUncertainty(m.r1Ohm, m.uncertainty.r1Ohm, 'Ω') },
  { header: 'L1', cell: (m) => formatWithUncertainty(m.l1H, m.uncertainty.l1H, 'H') },
  { header: 'C1', cell: (m) => formatWithUncertainty(m.c1F, m.uncertainty.c1F, 'F') },
  { header: 'Q', cell: (m) => formatWithUncertainty(m.q, m.uncertainty.q, '', 5) },
  { header: 'M', cell: (m) => formatNumber(m.m, 3) },
  { header: 'r = C0/C1', cell: (m) => formatNumber(m.r, 4) },
  { header: 'fr', cell: (m) => (m.frHz !== undefined ? formatHz(m.frHz, 10) : '—') },
  { header: 'Rr', cell: (m) => (m.rrOhm !== undefined ? formatQty(m.rrOhm, 'Ω', 4) : '—') },
  {
    header: 'Strength',
    cell: (m) =>
      m.strengthDb !== undefined ? `${m.strengthDb.toFixed(1)} dB (×${formatNumber(m.resistanceRatio, 3)})` : '—',
  },
];

const MODE_HEAD = {
  header: 'Mode',
  text: (m: ModeResult) => modeLabel(m) + (m.flagged ? ' — above the trusted instrument range' : ''),
};

type SweepInfo = SampleData['provenance']['sweeps'][number];

const SWEEP_COLUMNS: ReadonlyArray<Column<SweepInfo>> = [
  { header: 'File', cell: (w) => w.file, num: false, code: true },
  { header: 'Fixture', cell: (w) => w.fixture, num: false },
  { header: 'Conditions', cell: (w) => conditions(w), num: false },
  { header: 'Points', cell: (w) => (w.points !== undefined ? String(w.points) : '—') },
  {
    header: 'Span',
    cell: (w) =>
      w.startHz !== undefined && w.stopHz !== undefined ? `${formatHz(w.startHz, 7)} – ${formatHz(w.stopHz, 7)}` : '—',
  },
];

type DrivePoint = NonNullable<SampleData['drive']>['points'][number];

const DRIVE_COLUMNS: ReadonlyArray<Column<DrivePoint>> = [
  { header: 'Drive', cell: (d) => formatQty(d.driveW, 'W', 3) },
  { header: 'R1', cell: (d) => formatQty(d.r1Ohm, 'Ω', 4) },
  { header: 'fs', cell: (d) => formatHz(d.fsHz, 10) },
  { header: 'Sweep', cell: (d) => d.sweep, num: false },
];

type OtherCondition = SampleData['otherConditions'][number];

const OTHER_COLUMNS: ReadonlyArray<Column<OtherCondition>> = [
  { header: 'Sweep', cell: (o) => o.sweep, num: false },
  { header: 'Conditions', cell: (o) => conditions(o), num: false },
  { header: 'fs', cell: (o) => formatHz(o.fsHz, 10) },
  { header: 'R1', cell: (o) => formatQty(o.r1Ohm, 'Ω', 4) },
];

function conditions(s: {
  temperatureC?: number;
  driveW?: number;
  addedCapacitanceF?: number;
  addedConnection?: string;
  referenceImpedanceOhm?: number;
}): string {
  const parts: string[] = [];
  if (s.temperatureC !== undefined) parts.push(`${s.temperatureC} °C`);
  if (s.driveW !== undefined) parts.push(`drive ${formatQty(s.driveW, 'W', 3)}`);
  if (s.addedCapacitanceF !== undefined)
    parts.push(`${formatQty(s.addedCapacitanceF, 'F', 3)} added in ${s.addedConnection ?? 'parallel'}`);
  if (s.referenceImpedanceOhm !== undefined) parts.push(`Z0 ${formatQty(s.referenceImpedanceOhm, 'Ω', 3)}`);
  return parts.join(', ') || '—';
}

function diagnosticText(d: Diagnostic): string {
  return `${d.sweep ? `${d.sweep}: ` : ''}${d.message}`;
}

function sampleView(s: SampleData, partId: string, si: number): SampleView {
  const p = s.provenance;
  const provenance: Row[] = [
    { label: 'Measured by', value: p.by ?? 'not recorded' },
    { label: 'Date', value: p.measured ?? 'not recorded' },
    { label: 'Instrument', value: p.instrument ?? 'not recorded' },
    ...(p.instrumentMaxFrequencyHz !== undefined
      ? [{ label: 'Trusted up to', value: formatHz(p.instrumentMaxFrequencyHz, 4) }]
      : []),
    ...(p.lot ? [{ label: 'Lot', value: p.lot }] : []),
    { label: 'Reference conditions', value: conditions({ temperatureC: s.temperatureC, driveW: s.driveW }) },
  ];
  const comp = p.compensation;
  const plots: PlotLayout[] = [];
  const base = `${partId}-s${si}`.replace(/[^A-Za-z0-9_-]/g, '_');
  s.plots.modes.forEach((m, i) => plots.push(layoutPlot(modePlotSpec(m, `${base}-mode${i}`))));
  if (s.plots.wide) plots.push(layoutPlot(widePlotSpec(s.plots.wide, `${base}-wide`)));
  if (s.plots.pulling) plots.push(layoutPlot(pullingPlotSpec(s.plots.pulling, `${base}-pull`)));
  if (s.plots.temperature) plots.push(layoutPlot(temperaturePlotSpec(s.plots.temperature, `${base}-temp`)));
  const t = s.temperature;
  return {
    id: s.id,
    anchor: `sample-${s.id}`,
    ok: s.ok,
    provenance,
    sweeps: tableView(SWEEP_COLUMNS, p.sweeps),
    compensation: comp
      ? [
          comp.open && `open ${comp.open}`,
          comp.short && `short ${comp.short}`,
          comp.load && `load ${comp.load} (${formatQty(comp.loadResistanceOhm, 'Ω', 4)})`,
        ]
          .filter(Boolean)
          .join(', ') + (comp.fixture ? ` in a ${comp.fixture} fixture` : '')
      : undefined,
    modes: tableView(MODE_COLUMNS, s.modes, MODE_HEAD),
    c0: s.c0F !== undefined ? formatWithUncertainty(s.c0F, s.modes[0]?.uncertainty.c0F, 'F') : '—',
    fit: s.fit
      ? `${s.fit.converged ? 'converged' : 'did not converge'} after ${s.fit.iterations} iterations on ${s.fit.points} points; rms relative residual ${formatNumber(s.fit.rmsResidual, 2)}${s.fit.reason ? ` (${s.fit.reason})` : ''}`
      : undefined,
    crossChecks: [
      ...(s.c0CrossCheck ? [{ mode: 'shunt capacitance', checks: [crossCheckView(s.c0CrossCheck)] }] : []),
      ...s.modes
        .filter((m) => m.crossCheck.length)
        .map((m) => ({ mode: `${modeLabel(m)} at ${formatHz(m.fsHz, 8)}`, checks: m.crossCheck.map(crossCheckView) })),
    ],
    warnings: s.warnings,
    diagnostics: s.diagnostics.map((d) => ({ severity: d.severity, text: diagnosticText(d) })),
    drive: s.drive
      ? {
          table: tableView(DRIVE_COLUMNS, s.drive.points),
          summary: `resistance ratio max/min ${formatNumber(s.drive.resistanceRatio, 4)}; frequency shift from lowest to highest drive ${formatPpm(s.drive.frequencyShiftPpm, 3)}`,
        }
      : undefined,
    otherConditions: s.otherConditions.length ? tableView(OTHER_COLUMNS, s.otherConditions) : undefined,
    temperatureSummary: t
      ? `${t.form} fit about ${t.t0C} °C, rms residual ${formatNumber(t.rmsResidualPpm, 2)} ppm; turnover ${t.turnoverC.length ? t.turnoverC.map((x) => `${x.toFixed(1)} °C`).join(', ') : 'none in range'}; span ${t.spanPpm.toFixed(2)} ppm peak-to-peak over ${t.spanRangeC.min} to ${t.spanRangeC.max} °C`
      : undefined,
    plots,
  };
}

function pairRows(p: CapacitorPair): Row[] {
  return [
    {
      label: 'Capacitors (input / output pin)',
      value: `${formatQty(p.inputCapF, 'F', 3)} / ${formatQty(p.outputCapF, 'F', 3)}`,
    },
    { label: 'Pin totals Ca / Cb', value: `${formatQty(p.caF, 'F', 3)} / ${formatQty(p.cbF, 'F', 3)}` },
    { label: 'Load capacitance', value: formatQty(p.clF, 'F', 4) },
    { label: 'Frequency', value: formatHz(p.freqHz, 10) },
    { label: 'Offset from target', value: formatPpm(p.offsetPpm, 3) },
    { label: 'Offset band (tolerances)', value: `${formatPpm(p.bandPpm.min, 2)} … ${formatPpm(p.bandPpm.max, 2)}` },
    {
      label: 'Gain margin gm/gm,crit',
      value:
        formatNumber(p.gainMargin, 3) +
        (p.gainMarginDatasheet !== undefined ? ` (${formatNumber(p.gainMarginDatasheet, 3)} at datasheet ESR)` : ''),
    },
    {
      label: 'Resistance seen by the crystal pins',
      value: `${formatQty(p.pinsResistanceOhm, 'Ω', 4)} (RL ${formatQty(p.rlOhm, 'Ω', 4)})`,
    },
    { label: 'Resistance seen by the motional branch', value: formatQty(p.motionalResistanceOhm, 'Ω', 4) },
    {
      label: 'Start-up τ / time from noise',
      value: Number.isFinite(p.startupTauS)
        ? `${formatQty(p.startupTauS, 's', 3)} / ${formatQty(p.startupTimeS, 's', 3)}`
        : 'does not start',
    },
    { label: 'Estimated drive', value: formatQty(p.driveW, 'W', 3) },
  ];
}

function pierceView(a: PartData['pierce'][number], calc: PartData['calculator'], index: number): PierceView {
  const design = pierceDesignView(a, calc, `nr-curve-${index}`);
  const target = a.target
    ? `${formatHz(a.target.targetHz, 10)} (${a.target.targetBasis}); ideal load ${formatQty(a.target.idealLoadF, 'F', 4)}`
    : undefined;
  if (!a.ok)
    return {
      circuit: a.circuit,
      ok: false,
      reason: a.reason,
      target,
      pairs: [],
      checks: [],
      assumptions: a.assumptions,
      design,
    };
  const names = {
    frequency: 'Frequency',
    gainMargin: 'Gain margin',
    negativeResistance: 'Negative resistance',
    startup: 'Start-up',
    budget: 'Frequency budget',
    drive: 'Drive level',
  } as const;
  return {
    circuit: a.circuit,
    ok: true,
    target,
    pairs: [
      { title: `Equal pair (ideal ${formatQty(a.idealEqualCapF, 'F', 3)} each)`, rows: pairRows(a.equal) },
      { title: 'Closest pair', rows: pairRows(a.best) },
    ],
    checks: (Object.keys(names) as Array<keyof typeof names>).map((k) => ({
      label: names[k],
      verdict: a.best.checks[k].verdict,
      reason: a.best.checks[k].reason,
    })),
    assumptions: a.assumptions,
    design,
  };
}

const COMPLIANCE_LABEL = { frequency: 'Frequency', esr: 'ESR', c0: 'C0', overtone: 'Overtone' } as const;

type ComplianceCheck = keyof typeof COMPLIANCE_LABEL;

/** The compliance table's columns: header and the check whose verdict fills the cell. */
const COMPLIANCE_COLUMNS: ReadonlyArray<{ header: string; check: ComplianceCheck; value: (v: number) => string }> = [
  { header: 'Frequency at datasheet load', check: 'frequency', value: (v) => formatPpm(v, 2) },
  { header: 'ESR', check: 'esr', value: (v) => formatQty(v, 'Ω', 3) },
  { header: 'C0', check: 'c0', value: (v) => formatQty(v, 'F', 3) },
  { header: 'Overtone', check: 'overtone', value: (v) => String(v) },
];

type LotParameter = NonNullable<PartData['lotStats']>['parameters'][number];

/** Lot statistics columns; `f` formats a value of the row's quantity. */
function lotColumns(): ReadonlyArray<Column<LotParameter>> {
  const unitOf = (p: LotParameter) => (LOT_LABEL[p.parameter] ?? [p.parameter, ''])[1];
  const f = (p: LotParameter, v: number | undefined) =>
    unitOf(p) === '' ? formatNumber(v, 5) : formatQty(v, unitOf(p), unitOf(p) === 'Hz' ? 10 : 5);
  return [
    { header: 'n', cell: (p) => String(p.n) },
    { header: 'Mean', cell: (p) => f(p, p.mean) },
    {
      header: 'Std. dev.',
      cell: (p) =>
        p.std === undefined ? '—' : unitOf(p) === '' ? formatNumber(p.std, 2) : formatQty(p.std, unitOf(p), 2),
    },
    { header: 'Min', cell: (p) => f(p, p.min) },
    { header: 'Max', cell: (p) => f(p, p.max) },
    { header: 'Median', cell: (p) => f(p, p.median) },
    {
      header: 'Outliers',
      cell: (p) => (p.outliers.length ? p.outliers.map((o) => o.sample).join(', ') : p.note ? 'no test' : 'none'),
      num: false,
    },
  ];
}

const LOT_LABEL: Record<string, [string, string]> = {
  fsHz: ['fs', 'Hz'],
  r1Ohm: ['R1', 'Ω'],
  c1F: ['C1', 'F'],
  l1H: ['L1', 'H'],
  c0F: ['C0', 'F'],
  q: ['Q', ''],
  loadFreqHz: ['f at datasheet load', 'Hz'],
};

/** Build the part page's view model; `base` is the site base path ending in '/'. */
export function makePartView(d: PartData, base: string): PartView {
  const s = d.summary;
  const ds = d.datasheet;
  const sub = [
    KIND_LABEL[d.kind],
    d.package && `package ${d.package}`,
    d.supplier && `from ${d.supplier}`,
    d.supplierPart && `(${d.supplierPart})`,
  ]
    .filter(Boolean)
    .join(' · ');
  return {
    id: d.id,
    title: d.title,
    subtitle: sub,
    synthetic: d.synthetic,
    notesHtml: d.notes ? renderMarkdown(d.notes) : undefined,
    state: STATE_LABEL[s.state],
    stateClass: s.state,
    summary: [
      { label: 'Series resonance fs', value: formatHz(s.fsHz), si: s.fsHz },
      { label: 'Parallel resonance fp', value: formatHz(s.fpHz), si: s.fpHz },
      { label: 'Motional resistance R1', value: formatQty(s.r1Ohm, 'Ω', DISPLAY_DIGITS.r1Ohm), si: s.r1Ohm },
      { label: 'Motional inductance L1', value: formatQty(s.l1H, 'H', DISPLAY_DIGITS.l1H), si: s.l1H },
      { label: 'Motional capacitance C1', value: formatQty(s.c1F, 'F', DISPLAY_DIGITS.c1F), si: s.c1F },
      { label: 'Shunt capacitance C0', value: formatQty(s.c0F, 'F', DISPLAY_DIGITS.c0F), si: s.c0F },
      { label: 'Quality factor Q', value: formatNumber(s.q, DISPLAY_DIGITS.q), si: s.q },
      { label: 'Mode', value: s.overtone === undefined ? '—' : overtoneLabel(s.overtone) },
      {
        label: 'CL for the nominal frequency',
        value: formatQty(s.clForNominalF, 'F', DISPLAY_DIGITS.clF),
        si: s.clForNominalF,
        note:
          ds?.frequencyHz === undefined
            ? 'no datasheet frequency'
            : s.clForNominalF === undefined
              ? 'not reachable with a positive load'
              : undefined,
      },
    ],
    datasheet: ds
      ? [
          ds.frequencyHz !== undefined && { label: 'Nominal frequency', value: formatHz(ds.frequencyHz, 9) },
          ds.tolerancePpm !== undefined && { label: 'Tolerance', value: `±${ds.tolerancePpm} ppm` },
          ds.stabilityPpm !== undefined && { label: 'Stability', value: `±${ds.stabilityPpm} ppm` },
          ds.loadCapacitanceF !== undefined && {
            label: 'Load capacitance',
            value: ds.loadCapacitanceF === 'series' ? 'series resonance' : formatQty(ds.loadCapacitanceF, 'F', 3),
          },
          ds.esrMaxOhm !== undefined && { label: 'ESR at most', value: formatQty(ds.esrMaxOhm, 'Ω', 3) },
          ds.c0MaxF !== undefined && { label: 'C0 at most', value: formatQty(ds.c0MaxF, 'F', 3) },
          ds.driveMaxW !== undefined && { label: 'Drive at most', value: formatQty(ds.driveMaxW, 'W', 3) },
          ds.overtone !== undefined && { label: 'Overtone', value: String(ds.overtone) },
          ds.operatingRangeC !== undefined && {
            label: 'Operating range',
            value: `${ds.operatingRangeC.min} to ${ds.operatingRangeC.max} °C`,
          },
        ].filter((r): r is Row => !!r)
      : [],
    compliance: d.compliance.map((c) => ({
      sample: c.sample,
      basis: c.frequencyBasis,
      rule: c.mainModeRule,
      items: c.items.map((i) => ({ label: COMPLIANCE_LABEL[i.check], value: i.reason, state: i.verdict })),
      cells: COMPLIANCE_COLUMNS.map((col) => {
        const i = c.items.find((x) => x.check === col.check);
        if (!i) return { text: '—', state: 'unknown', title: '', label: col.header };
        return {
          text: i.value === undefined ? '' : col.value(i.value),
          state: i.verdict,
          title: i.reason,
          label: col.header,
        };
      }),
    })),
    complianceHeaders: COMPLIANCE_COLUMNS.map((col) => col.header),
    samples: d.samples.map((s, i) => sampleView(s, d.id, i)),
    lotStats: d.lotStats
      ? {
          n: d.lotStats.n,
          rule: d.lotStats.outlierRule,
          notes: d.lotStats.notes,
          table: tableView(lotColumns(), d.lotStats.parameters, {
            header: 'Parameter',
            text: (p) => (LOT_LABEL[p.parameter] ?? [p.parameter])[0],
          }),
        }
      : undefined,
    pierce: d.pierce.map((a, i) => pierceView(a, d.calculator, i)),
    cautions: [...PART_CAUTIONS],
    downloads: d.downloads.map((x) => ({
      href: `${base}downloads/${encodeURIComponent(d.id)}/${x.name.split('/').map(encodeURIComponent).join('/')}`,
      label: x.label,
      name: x.name,
      size: formatBytes(x.bytes),
    })),
    recordWarnings: d.recordWarnings,
  };
}
