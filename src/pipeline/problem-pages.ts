/**
 * Preview builds only (`motional preview`): a record with errors gets, at its part page's
 * address, a page that lists its problems (file, line, message) instead of failing the build,
 * so an author sees what to fix where the part will appear. The published build never writes
 * these pages: it refuses invalid records.
 */
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { formatIssue, type Issue } from '../lib/issues.ts';

/** An invalid record and its issues. */
export interface RecordProblems {
  /** Part id as read from the record, when it could be read. */
  id?: string;
  yamlFile: string;
  issues: Issue[];
}

/** A name that is safe as one folder of a site path. */
const SAFE_SEGMENT = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;

/** Where a record's problems are shown: its id, else its folder's name; undefined when neither is a safe path. */
export function problemPageId(p: RecordProblems): string | undefined {
  for (const candidate of [p.id, basename(dirname(p.yamlFile))])
    if (candidate && SAFE_SEGMENT.test(candidate)) return candidate;
  return undefined;
}

const escapeHtml = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The page of one record's problems (plain HTML, no script, the site's CSP). */
export function problemPageHtml(p: RecordProblems, id: string, basePath: string): string {
  const items = p.issues
    .map((i) => `<li class="${i.severity}"><code>${escapeHtml(formatIssue(i))}</code></li>`)
    .join('\n');
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'self'; script-src 'self'; style-src 'self'; object-src 'none'; base-uri 'self'">
<meta name="viewport" content="width=device-width, initial-scale=1"><meta name="robots" content="noindex">
<title>${escapeHtml(id)} — record problems · Motional preview</title></head>
<body><main>
<p><a href="${escapeHtml(basePath)}">Catalogue</a> / ${escapeHtml(id)}</p>
<h1>${escapeHtml(id)}: the record has problems</h1>
<p>This part is left out of the catalogue until its record is fixed; <code>motional build</code> refuses it.
The page comes back here when the record is saved again.</p>
<ul class="problems">
${items}
</ul>
</main></body></html>
`;
}

/**
 * Write the problem pages into a built site (replacing what is at their address: the folder may
 * hold hard links shared with the previous site, so files are removed, never written over).
 * Records whose id is published by a valid record (a duplicate) keep the valid part's page.
 * @returns the ids that got a page
 */
export async function writeProblemPages(
  siteDir: string,
  problems: RecordProblems[],
  published: ReadonlySet<string>,
  basePath: string,
): Promise<string[]> {
  const written: string[] = [];
  for (const p of problems) {
    const id = problemPageId(p);
    if (!id || published.has(id) || written.includes(id)) continue;
    const dir = join(siteDir, 'parts', id);
    await rm(dir, { recursive: true, force: true });
    await mkdir(dir, { recursive: true });
    await writeFile(join(dir, 'index.html'), problemPageHtml(p, id, basePath));
    written.push(id);
  }
  return written;
}
