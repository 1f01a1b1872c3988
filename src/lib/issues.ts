/**
 * Issues: a problem found in an input, as data. The message text is produced from it.
 *
 * Every issue names the file, and where possible the line (1-based), column and the field
 * path inside a record (dot/bracket form, e.g. `samples[0].sweeps[1].file`).
 */
export type Severity = 'error' | 'warning';

export interface Issue {
  severity: Severity;
  /** Path of the file as the user gave it (or relative to the working directory). */
  file: string;
  /** 1-based line; absent when the problem concerns the file as a whole. */
  line?: number;
  /** 1-based column. */
  col?: number;
  /** Field path inside a record, e.g. `samples[0].sweeps[1].file`. */
  path?: string;
  /** Terse, lower-case message including the bad value and what was expected. */
  message: string;
  /** Short machine-readable code, e.g. `unit`, `touchstone-row`, `path-escape`. */
  code?: string;
}

/** Compiler-style one-line form: `FILE:LINE: path: message` (line 1 when unknown). */
export function formatIssue(issue: Issue): string {
  const where = `${issue.file}:${issue.line ?? 1}`;
  const path = issue.path ? `${issue.path}: ` : '';
  const tag = issue.severity === 'warning' ? 'warning: ' : '';
  return `${where}: ${tag}${path}${issue.message}`;
}

/** Thrown by readers when input is unusable; carries every issue found, all located. */
export class InputError extends Error {
  readonly issues: Issue[];
  constructor(issues: Issue[]) {
    super(issues.map(formatIssue).join('\n'));
    this.name = 'InputError';
    this.issues = issues;
  }
}

/** Convenience: make an error issue. */
export function errorAt(file: string, line: number | undefined, message: string, extra: Partial<Issue> = {}): Issue {
  return { severity: 'error', file, line, message, ...extra };
}
