/**
 * The text of a draft `part.yaml` (README: Commands, `motional new`; README: The part record).
 * Every value inferred from the data carries a comment saying so and what to check; values only
 * a person knows (supplier, part number, lot, datasheet limits, drive) are commented placeholders.
 */
import { fmt, type DraftPlan } from './plan-draft.ts';

/** YAML double-quoted string (the record's text fields are shown as text, never interpreted). */
function q(text: string): string {
  return JSON.stringify(text);
}

/** A comment on its own, safe for any file name (no line breaks). */
function c(text: string): string {
  return text.replace(/[\r\n\u2028\u2029]+/g, ' ');
}

/** Draft record text for a plan. */
export function draftYaml(plan: DraftPlan, id: string, sourceNote: string): string {
  const L: string[] = [];
  L.push(`# Draft written by "motional new" from ${c(sourceNote)}.`);
  L.push('# Values marked "inferred" come from the data: check each one. Lines starting with "# "');
  L.push('# below a key are placeholders for what only you know: fill them in and remove the "#".');
  L.push('# Then run: npm run -s motional -- check <this folder>');
  L.push(`id: ${q(id)}  # from the folder name (or --id); check it is unique in the catalogue`);
  L.push(
    `title: ${q(`${fmt(plan.nominalHz, 'Hz', 5)} ${plan.kind} part (draft)`)}  # placeholder: say what the part is and where it is used`,
  );
  L.push(`kind: ${plan.kind}  # ${c(plan.kindNote)}; check`);
  L.push('# package: "3225"  # the package, from the datasheet');
  L.push('# supplier: ""  # only you know: the supplier');
  L.push('# supplierPart: ""  # only you know: the supplier\'s part number');
  L.push('datasheet:');
  L.push(
    `  frequency: ${fmt(plan.nominalHz, 'Hz', 5)}  # inferred: the main mode's fs (${fmt(plan.mainFsHz, 'Hz', 9)}) to 5 digits; write the datasheet's nominal frequency`,
  );
  L.push('  # tolerance: 10 ppm  # from the datasheet, at 25 °C');
  L.push('  # stability: 20 ppm  # from the datasheet, over the operating range');
  L.push('  # loadCapacitance: 8 pF  # from the datasheet (or: series)');
  L.push('  # esrMax: 80 ohm  # from the datasheet');
  L.push('  # c0Max: 3 pF  # from the datasheet');
  L.push('  # driveMax: 100 uW  # from the datasheet: never measure above it');
  L.push('  # operatingRange: -40 to 85 C  # from the datasheet');
  L.push('samples:');
  L.push('  - id: A1  # one sample: every sweep in this folder is taken as one physical unit; check');
  L.push('    # lot: ""  # only you know');
  L.push('    # measured: 2026-01-31  # only you know: the date of the measurement');
  L.push('    # by: ""  # only you know');
  L.push('    # instrument: ""  # only you know');
  L.push('    # temperature: 25 C  # only you know');
  if (plan.compensation) {
    const comp = plan.compensation;
    L.push(`    compensation:  # inferred: ${c(comp.note)}; check they were taken in the same fixture`);
    L.push(`      open: ${q(comp.open)}`);
    L.push(`      short: ${q(comp.short)}`);
    if (plan.sweeps[0] && plan.sweeps[0].fixture !== comp.fixture)
      L.push(`      fixture: ${comp.fixture}  # inferred: the fixture of the sweeps these correct`);
    if (comp.load) {
      L.push(
        `      # load: ${q(comp.load)}  # found; give the standard's true resistance, then remove the "#" on both lines`,
      );
      L.push('      # loadResistance: 50 ohm');
    }
  }
  L.push('    sweeps:');
  for (const s of plan.sweeps) {
    L.push(`      - file: ${q(s.file)}  # ${c(s.formatNote)}`);
    L.push(`        # inferred role: ${c(s.roleNote)}`);
    L.push(`        fixture: ${s.fixture}  # inferred: ${c(s.fixtureNote)}${s.fixtureUnsure ? '' : '; check'}`);
    if (s.referenceImpedanceOhm !== undefined)
      L.push(`        referenceImpedance: ${fmt(s.referenceImpedanceOhm, 'ohm', 9)}  # from the file's option line`);
    if (s.addedCapacitanceF !== undefined && s.addedConnection) {
      L.push(
        `        addedCapacitance: ${fmt(s.addedCapacitanceF, 'F', 3)}  # inferred from the shift it caused; write the capacitor's measured value`,
      );
      L.push(`        addedConnection: ${s.addedConnection}  # inferred; check how the capacitor was connected`);
    } else if (s.role === 'loaded') {
      L.push(
        "        # addedCapacitance: 10 pF  # loaded, but the data do not say how much: write the capacitor's measured value",
      );
      L.push('        # addedConnection: parallel');
    }
    L.push('        # drive: 10 uW  # only you know: the power into the part');
  }
  if (plan.skipped.length) {
    L.push('# Files not used:');
    for (const k of plan.skipped) L.push(`#   ${c(k.file)}: ${c(k.reason)}`);
  }
  return `${L.join('\n')}\n`;
}
