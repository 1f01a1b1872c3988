/**
 * Load one part record: its part.yaml and every sweep file it names, read, converted to the
 * impedance of the part (fixture conversion, open/short(/load) compensation) and checked.
 *
 * Nothing throws for bad input: every problem becomes an {@link Issue} naming a file.
 * - Problems with a reference (unsafe or missing file, wrong ending, CSV with a network
 *   fixture) are located at the record field, e.g. `part.yaml:14 samples[0].sweeps[1].file`.
 * - Problems inside a sweep file are located at the sweep file's own line.
 * - Fixture conversion problems that have no line in the sweep file (a 1-port file with a
 *   through fixture) are located at the record's `fixture` field and name the sweep file.
 *
 * When the record has errors, the samples that are valid on their own still get their sweep
 * files checked, so one run of `check` reports as much as it can.
 */
import { dirname, join } from 'node:path';
import { InputError, type Issue } from '../lib/issues.ts';
import {
  formatFieldPath,
  MAX_PART_YAML_BYTES,
  parsePartYaml,
  type FieldPath,
  type FieldPosition,
} from '../lib/io/part-yaml.ts';
import { parseTouchstone } from '../lib/io/touchstone.ts';
import { parseSweepCsv, type CsvLayout } from '../lib/io/sweep-csv.ts';
import { MAX_SWEEP_BYTES } from '../lib/io/limits.ts';
import { networkToImpedance } from '../lib/fixture/to-impedance.ts';
import { compensateOpenShort, compensateOpenShortLoad } from '../lib/fixture/compensation.ts';
import { SampleSchema, type Fixture, type Part, type Sample, type SweepRef } from '../lib/schema/part.ts';
import type { ImpedanceSweep, NetworkData } from '../lib/sweep/sweep.ts';
import { nodeFileSource, type FileSource } from './file-source.ts';
import { badExtensionMessage, findCaseCollisions, resolveInPartFolder, sweepFormatOf } from './safe-path.ts';

/** One measurement sweep of a sample, as read. */
export interface LoadedSweep {
  /** Id of the sample the sweep belongs to. */
  sampleId: string;
  /** Index of the sweep in the sample's `sweeps` list. */
  index: number;
  ref: SweepRef;
  /** Path of the sweep file (part folder joined with the name in the record). */
  file: string;
  /** Impedance of the part, ohm: fixture-converted and compensated; absent when unreadable. */
  impedance?: ImpedanceSweep;
  /** The raw network data, for Touchstone files. */
  network?: NetworkData;
}

export interface LoadedPart {
  /** Path of part.yaml as given (or the folder joined with `part.yaml`). */
  yamlFile: string;
  folder: string;
  /** The validated record; absent when it has errors. */
  part?: Part;
  /** Every issue of this part (record and sweep files), errors and warnings. */
  issues: Issue[];
  /** Sweeps of the valid samples, in record order; those with errors lack `impedance`. */
  sweeps: LoadedSweep[];
  /** Part id, also when the record has errors elsewhere (for duplicate checks). */
  id?: string;
  /** Line and column of a record field in part.yaml. */
  locate(path: FieldPath): FieldPosition;
}

/** Relative difference above which a record's referenceImpedance and a file's R disagree. */
const Z0_REL_TOL = 1e-9;

/**
 * Load a part from its part.yaml or its folder.
 * @param pathToYamlOrFolder a `part.yaml` (any name) or the folder holding `part.yaml`
 * @param fs file access (default node:fs)
 */
export async function loadPart(pathToYamlOrFolder: string, fs: FileSource = nodeFileSource): Promise<LoadedPart> {
  const given = await fs.stat(pathToYamlOrFolder);
  const isFolder = given?.kind === 'directory';
  const yamlFile = isFolder ? join(pathToYamlOrFolder, 'part.yaml') : pathToYamlOrFolder;
  const folder = isFolder ? pathToYamlOrFolder : dirname(pathToYamlOrFolder);
  const loaded: LoadedPart = { yamlFile, folder, issues: [], sweeps: [], locate: () => ({}) };
  const fileIssue = (message: string, code: string) =>
    loaded.issues.push({ severity: 'error', file: yamlFile, message, code });

  const st = isFolder ? await fs.stat(yamlFile) : given;
  if (!st) {
    fileIssue(isFolder ? 'no part.yaml in this folder' : 'file not found', 'missing');
    return loaded;
  }
  if (st.kind !== 'file')
    return (fileIssue('expected a part.yaml file, got a folder or special file', 'not-file'), loaded);
  if (st.sizeBytes > MAX_PART_YAML_BYTES) {
    return (
      fileIssue(
        `file is ${st.sizeBytes} bytes, over the limit of ${MAX_PART_YAML_BYTES} bytes for a part record`,
        'size',
      ),
      loaded
    );
  }
  let text: string;
  try {
    text = await fs.readText(yamlFile);
  } catch (e) {
    return (fileIssue(`cannot read the file (${errorCode(e)})`, 'read'), loaded);
  }

  const parsed = parsePartYaml(text, yamlFile);
  loaded.issues.push(...parsed.issues);
  loaded.locate = parsed.locate;
  loaded.part = parsed.part;
  const rawId = (parsed.data as { id?: unknown } | undefined)?.id;
  if (parsed.part) loaded.id = parsed.part.id;
  else if (typeof rawId === 'string' || typeof rawId === 'number') loaded.id = String(rawId);

  const samples: Array<[number, Sample]> = parsed.part
    ? parsed.part.samples.map((s, i) => [i, s])
    : validSamplesOf(parsed.data);
  const at = (path: FieldPath, message: string, code: string, severity: Issue['severity'] = 'error') =>
    loaded.issues.push({
      severity,
      file: yamlFile,
      ...parsed.locate(path),
      path: formatFieldPath(path),
      message,
      code,
    });

  reportCaseCollisions(samples, at);
  const reader = new SweepReader(folder, fs, at, loaded.issues);
  for (const [i, sample] of samples) {
    for (const [j, ref] of sample.sweeps.entries()) {
      const sweepPath: FieldPath = ['samples', i, 'sweeps', j];
      const layout =
        ref.headerLine !== undefined || ref.columns !== undefined
          ? { headerLine: ref.headerLine, columns: ref.columns }
          : undefined;
      const read = await reader.read(ref.file, ref.fixture, [...sweepPath, 'file'], [...sweepPath, 'fixture'], layout);
      const sweep: LoadedSweep = {
        sampleId: sample.id,
        index: j,
        ref,
        file: read.file,
        network: read.network,
        impedance: read.impedance,
      };
      if (read.network && ref.referenceImpedanceOhm !== undefined) {
        const fileZ0 = read.network.z0Ohm[0];
        if (Math.abs(fileZ0 - ref.referenceImpedanceOhm) > Z0_REL_TOL * fileZ0) {
          at(
            [...sweepPath, 'referenceImpedance'],
            `referenceImpedance ${ref.referenceImpedanceOhm} ohm differs from the reference ${fileZ0} ohm in ${ref.file}; the file's value is used`,
            'reference-impedance',
            'warning',
          );
        }
      }
      const comp = sample.compensation;
      // Compensation sweeps belong to one fixture (its own `fixture`, else the sample's first
      // sweep's): they correct the sweeps taken in that fixture and leave others (say, an
      // impedance-analyser export beside network-analyser sweeps) as they are.
      const compFixture = comp?.fixture ?? sample.sweeps[0].fixture;
      if (comp?.open !== undefined && comp.short !== undefined && ref.fixture === compFixture) {
        const compPath: FieldPath = ['samples', i, 'compensation'];
        const fixturePath: FieldPath = comp.fixture ? [...compPath, 'fixture'] : ['samples', i, 'sweeps', 0, 'fixture'];
        const open = await reader.read(comp.open, compFixture, [...compPath, 'open'], fixturePath);
        const short = await reader.read(comp.short, compFixture, [...compPath, 'short'], fixturePath);
        const load =
          comp.load !== undefined
            ? await reader.read(comp.load, compFixture, [...compPath, 'load'], fixturePath)
            : undefined;
        if (sweep.impedance && open.impedance && short.impedance && (!load || load.impedance)) {
          const z = sweep.impedance;
          sweep.impedance = reader.guard(
            () =>
              load?.impedance && comp.loadResistanceOhm !== undefined
                ? compensateOpenShortLoad(z, open.impedance!, short.impedance!, load.impedance, comp.loadResistanceOhm)
                : compensateOpenShort(z, open.impedance!, short.impedance!),
            read.file,
            { path: compPath, name: '' },
          );
        } else {
          sweep.impedance = undefined;
        }
      }
      loaded.sweeps.push(sweep);
    }
  }
  return loaded;
}

/** Samples that pass validation on their own, with their index, from a record that has errors. */
function validSamplesOf(data: unknown): Array<[number, Sample]> {
  const raw = (data as { samples?: unknown } | undefined)?.samples;
  if (!Array.isArray(raw)) return [];
  const out: Array<[number, Sample]> = [];
  raw.forEach((s, i) => {
    const r = SampleSchema.safeParse(s);
    if (r.success) out.push([i, r.data]);
  });
  return out;
}

type At = (path: FieldPath, message: string, code: string, severity?: Issue['severity']) => void;

/** Names in one record that differ only by letter case or Unicode normalisation are an error at the later reference. */
function reportCaseCollisions(samples: Array<[number, Sample]>, at: At): void {
  const refs: Array<{ name: string; path: FieldPath }> = [];
  for (const [i, s] of samples) {
    for (const key of ['open', 'short', 'load'] as const) {
      const name = s.compensation?.[key];
      if (name !== undefined) refs.push({ name, path: ['samples', i, 'compensation', key] });
    }
    s.sweeps.forEach((sw, j) => refs.push({ name: sw.file, path: ['samples', i, 'sweeps', j, 'file'] }));
  }
  for (const [first, later] of findCaseCollisions(refs.map((r) => r.name))) {
    const ref = refs.find((r) => r.name === later)!;
    at(
      ref.path,
      `"${later}" and "${first}" differ only by letter case or Unicode normalisation; they are one file on some systems and two on others, rename one`,
      'path-case',
    );
  }
}

interface ReadResult {
  file: string;
  impedance?: ImpedanceSweep;
  network?: NetworkData;
}

/** Reads sweep files of one part; a file read twice with the same fixture is read (and reported) once. */
class SweepReader {
  private cache = new Map<string, Promise<ReadResult>>();
  constructor(
    private folder: string,
    private fs: FileSource,
    private at: At,
    private issues: Issue[],
  ) {}

  read(
    name: string,
    fixture: Fixture,
    filePath: FieldPath,
    fixturePath: FieldPath,
    layout?: CsvLayout,
  ): Promise<ReadResult> {
    const key = `${fixture}\u0000${name}\u0000${layout ? JSON.stringify(layout) : ''}`;
    let result = this.cache.get(key);
    if (!result) {
      result = this.readOnce(name, fixture, filePath, fixturePath, layout);
      this.cache.set(key, result);
    }
    return result;
  }

  private async readOnce(
    name: string,
    fixture: Fixture,
    filePath: FieldPath,
    fixturePath: FieldPath,
    layout?: CsvLayout,
  ): Promise<ReadResult> {
    const fallback = join(this.folder, name);
    const format = sweepFormatOf(name);
    if (!format) {
      this.at(filePath, badExtensionMessage(name), 'extension');
      return { file: fallback };
    }
    const resolved = await resolveInPartFolder(this.folder, name, this.fs);
    if (!resolved.ok) {
      this.at(filePath, resolved.message, resolved.code);
      return { file: fallback };
    }
    const file = resolved.path;
    if (resolved.sizeBytes > MAX_SWEEP_BYTES) {
      this.issues.push({
        severity: 'error',
        file,
        message: `file is ${resolved.sizeBytes} bytes, over the limit of ${MAX_SWEEP_BYTES} bytes`,
        code: 'size',
      });
      return { file };
    }
    let text: string;
    try {
      text = await this.fs.readText(file);
    } catch (e) {
      this.at(filePath, `cannot read ${name} (${errorCode(e)})`, 'read');
      return { file };
    }
    if (format === 'csv') {
      if (fixture !== 'impedance') {
        this.at(
          fixturePath,
          `${name} is a CSV impedance sweep; expected fixture "impedance", got "${fixture}"`,
          'fixture',
        );
      }
      const impedance = this.guard(() => parseSweepCsv(text, file, layout), file);
      return { file, impedance: fixture === 'impedance' ? impedance : undefined };
    }
    const network = this.guard(() => parseTouchstone(text, file), file);
    if (!network) return { file };
    const impedance = this.guard(() => networkToImpedance(network, fixture, file), file, { path: fixturePath, name });
    return { file, network, impedance };
  }

  /**
   * Run a reader; InputError issues are recorded (those without a line, when `relocate` is
   * given, move to that record field), any other exception becomes an "internal error" issue.
   */
  guard<T>(f: () => T, file: string, relocate?: { path: FieldPath; name: string }): T | undefined {
    try {
      return f();
    } catch (e) {
      if (e instanceof InputError) {
        for (const issue of e.issues) {
          if (relocate && issue.line === undefined) {
            this.at(
              relocate.path,
              relocate.name ? `${relocate.name}: ${issue.message}` : issue.message,
              issue.code ?? 'fixture',
              issue.severity,
            );
          } else this.issues.push(issue);
        }
      } else {
        this.issues.push({
          severity: 'error',
          file,
          message: `internal error while reading: ${e instanceof Error ? e.message : String(e)}`,
          code: 'internal',
        });
      }
      return undefined;
    }
  }
}

function errorCode(e: unknown): string {
  return (e as { code?: string })?.code ?? (e instanceof Error ? e.message : String(e));
}
