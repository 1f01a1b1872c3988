/**
 * `motional new FOLDER` (README: Commands): read every sweep file of a folder and write a draft
 * `part.yaml` beside them. Never overwrites a record (the file is created exclusively), writes
 * nothing when no file can be read or the folder holds more than one part, and lists every file
 * it could not use with the reason.
 */
import { writeFile } from 'node:fs/promises';
import { basename, join, resolve } from 'node:path';
import { InputError, formatIssue } from '../lib/issues.ts';
import { MAX_SWEEP_BYTES } from '../lib/io/limits.ts';
import { parseTouchstone } from '../lib/io/touchstone.ts';
import { readSweepCsv } from '../lib/io/sweep-csv.ts';
import { draftYaml } from '../lib/draft/draft-yaml.ts';
import { planDraft, type DraftInputFile, type DraftPlan } from '../lib/draft/plan-draft.ts';
import type { PartKind } from '../lib/schema/part.ts';
import { nodeFileSource, type FileSource } from './file-source.ts';
import { checkPartFileName, sweepFormatOf, SWEEP_EXTENSIONS } from './safe-path.ts';

export interface DraftFolderOptions {
  id?: string;
  kind?: PartKind;
  fs?: FileSource;
  /** Write the file (default); false: only plan (tests, timing). */
  write?: boolean;
}

export type DraftFolderResult =
  | { ok: true; yamlFile: string; text: string; plan: DraftPlan; skipped: Array<{ file: string; reason: string }> }
  | { ok: false; message: string; skipped: Array<{ file: string; reason: string }> };

const ID = /^[A-Za-z0-9._-]{1,64}$/;

/** Plan and write the draft of one folder. */
export async function draftFolder(folder: string, opts: DraftFolderOptions = {}): Promise<DraftFolderResult> {
  const fs = opts.fs ?? nodeFileSource;
  const st = await fs.stat(folder);
  if (!st || st.kind !== 'directory')
    return { ok: false, message: `${folder}: expected a folder of sweep files`, skipped: [] };
  const yamlFile = join(folder, 'part.yaml');
  if (await fs.stat(yamlFile))
    return {
      ok: false,
      message: `${yamlFile} exists; a draft never replaces a record (edit it, or move it away first)`,
      skipped: [],
    };
  const id = opts.id ?? idFromFolder(folder);
  if (!ID.test(id)) {
    return {
      ok: false,
      message: `part id "${id.slice(0, 80)}" (from ${opts.id ? '--id' : 'the folder name'}): expected letters, digits, '.', '_' or '-', at most 64; give one with --id`,
      skipped: [],
    };
  }
  const names = (await fs.list(folder)).filter((n) => !n.startsWith('.')).sort();
  const files: DraftInputFile[] = [];
  const skipped: Array<{ file: string; reason: string }> = [];
  for (const name of names) {
    const path = join(folder, name);
    const s = await fs.stat(path);
    if (!s || s.kind !== 'file') continue;
    const format = sweepFormatOf(name);
    if (!format) {
      skipped.push({ file: name, reason: `not a sweep file (expected ${Object.keys(SWEEP_EXTENSIONS).join(', ')})` });
      continue;
    }
    const nameCheck = checkPartFileName(name);
    if (!nameCheck.ok) {
      files.push({ name, error: nameCheck.message });
      continue;
    }
    if (s.sizeBytes > MAX_SWEEP_BYTES) {
      files.push({ name, error: `file is ${s.sizeBytes} bytes, over the limit of ${MAX_SWEEP_BYTES} bytes` });
      continue;
    }
    let text: string;
    try {
      text = await fs.readText(path);
    } catch (e) {
      files.push({ name, error: `cannot read the file (${(e as { code?: string }).code ?? String(e)})` });
      continue;
    }
    try {
      if (format === 'touchstone') files.push({ name, network: parseTouchstone(text, name) });
      else {
        const read = readSweepCsv(text, name);
        const cols = Object.entries(read.columns)
          .map(([role, col]) => `${role}: "${col.name}"`)
          .join(', ');
        files.push({
          name,
          impedance: read.sweep,
          csv: { headerLine: read.headerLine, preambleLines: read.preambleLines, columns: cols },
        });
      }
    } catch (e) {
      const message =
        e instanceof InputError
          ? e.issues.slice(0, 3).map(formatIssue).join('; ')
          : `internal error while reading: ${e instanceof Error ? e.message : String(e)}`;
      files.push({ name, error: message });
    }
  }
  const readable = files.filter((f) => !('error' in f));
  if (readable.length === 0) {
    const all = [...skipped, ...files.map((f) => ({ file: f.name, reason: 'error' in f ? f.error : '' }))];
    return {
      ok: false,
      message:
        names.length === 0
          ? `${folder}: the folder is empty`
          : `${folder}: no sweep file could be read; nothing written`,
      skipped: all,
    };
  }
  const outcome = planDraft(files, { kind: opts.kind });
  if (!outcome.ok)
    return {
      ok: false,
      message: `${folder}: ${outcome.message}; nothing written`,
      skipped: [...skipped, ...outcome.skipped],
    };
  const plan = { ...outcome.plan, skipped: [...skipped, ...outcome.plan.skipped] };
  const text = draftYaml(
    plan,
    id,
    `the ${readable.length} sweep file${readable.length === 1 ? '' : 's'} in this folder`,
  );
  if (opts.write !== false) {
    try {
      // 'wx': fails when the file appeared meanwhile; a record is never replaced.
      await writeFile(yamlFile, text, { flag: 'wx' });
    } catch (e) {
      return {
        ok: false,
        message: `cannot write ${yamlFile} (${(e as { code?: string }).code ?? String(e)}); nothing written`,
        skipped: plan.skipped,
      };
    }
  }
  return { ok: true, yamlFile, text, plan, skipped: plan.skipped };
}

function idFromFolder(folder: string): string {
  return (
    basename(resolve(folder))
      .replace(/[^A-Za-z0-9._-]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 64) || 'PART'
  );
}
