/**
 * Hostile text in a record (test/fixtures/hostile/HOSTILE-1: markup, script, template and
 * netlist break-out attempts in every free-text field and in sweep file names) stays text in
 * every download: SPICE netlists keep it inside `*` comment lines (checked line by line, and by
 * Debian ngspice, which runs any `.control` block it sees), the model Touchstone inside `!`
 * lines, the Markdown notes become only the tags the subset allows, and the page data keeps the
 * text unchanged for the pages to escape. Property-based tests do the same for random text.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import type { PartResult } from '../../src/lib/extract/types.ts';
import { parseTouchstone } from '../../src/lib/io/touchstone.ts';
import type { BvdModel } from '../../src/lib/models/bvd.ts';
import { formatNetlist, type NetlistInfo } from '../../src/lib/models/netlist-spice.ts';
import { makeDownloads, type DownloadFile } from '../../src/pipeline/emit.ts';
import { loadPart, type LoadedPart } from '../../src/pipeline/load-part.ts';
import { makePartData } from '../../src/lib/report/part-data.ts';
import { isSafeUrl, renderMarkdown } from '../../src/site/markdown.ts';
import { main } from '../../scripts/motional.ts';
import { requireTool } from '../support/tools.ts';
import { FUZZ_SEED, FuzzCounter, ROOT } from './fuzz-support.ts';
import { HOSTILE, PORTABLE_NAMES } from '../fixtures/hostile/make.ts';

const counter = new FuzzCounter('hostile-text');
afterAll(() => counter.write());

const PART_DIR = join(ROOT, 'test/fixtures/hostile/HOSTILE-1');

/**
 * Lines of a netlist that SPICE reads as something other than a comment, with their kind; throws
 * on a line that is neither one of the writer's element/subcircuit lines nor a `*` comment.
 */
function spiceLines(netlist: string): Array<{ kind: 'comment' | 'element' | 'subckt' | 'ends'; line: string }> {
  expect(netlist.endsWith('\n')).toBe(true);
  return netlist
    .slice(0, -1)
    .split('\n')
    .map((line) => {
      // printable ASCII only: no CR, form feed, Unicode line separator or bidi control can hide a line break
      if (!/^[\x20-\x7e]*$/.test(line))
        throw new Error(`non-printable character in netlist line ${JSON.stringify(line)}`);
      if (line.startsWith('*')) return { kind: 'comment', line };
      if (/^\.subckt [A-Za-z][A-Za-z0-9_]* 1 2$/.test(line)) return { kind: 'subckt', line };
      if (/^\.ends [A-Za-z][A-Za-z0-9_]*$/.test(line)) return { kind: 'ends', line };
      if (/^(C0 1 2|R\d+ 1 b\d+a|L\d+ b\d+a b\d+b|C\d+ b\d+b 2) [-+]?\d\.\d+e[-+]\d+$/.test(line))
        return { kind: 'element', line };
      throw new Error(`netlist line is neither a comment nor an element: ${JSON.stringify(line)}`);
    });
}

/** The structure of a netlist: one .subckt, elements, one .ends last, comments only before .subckt or between branches. */
function expectOnlyModelLines(netlist: string, branches: number): void {
  const lines = spiceLines(netlist);
  const kinds = lines.map((l) => l.kind);
  expect(kinds.filter((k) => k === 'subckt')).toHaveLength(1);
  expect(kinds.at(-1)).toBe('ends');
  expect(kinds.filter((k) => k === 'element')).toHaveLength(1 + 3 * branches);
}

/** Tags the notes Markdown subset may produce (src/site/markdown.ts). */
function expectOnlyAllowedTags(html: string): void {
  for (const m of html.matchAll(/<[^>]*>?/g)) {
    const tag = m[0];
    const a = /^<a href="([^"]*)" rel="noopener noreferrer">$/.exec(tag);
    if (a) {
      const href = a[1]
        .replace(/&#(\d+);/g, (_, d) => String.fromCharCode(Number(d)))
        .replace(/&quot;/g, '"')
        .replace(/&lt;/g, '<')
        .replace(/&gt;/g, '>')
        .replace(/&amp;/g, '&');
      if (!isSafeUrl(href) || /^\s*(javascript|data|vbscript):/i.test(href)) throw new Error(`unsafe link ${tag}`);
      continue;
    }
    if (!/^<\/?(p|ul|ol|li|em|strong|code)>$|^<\/a>$/.test(tag))
      throw new Error(`tag ${JSON.stringify(tag)} in rendered notes`);
  }
  // no raw attribute text survives outside a tag either: `=` is escaped in text
  expect(html).not.toMatch(/on[a-z]+=/i);
}

describe('netlist comments hold any text', () => {
  const model: BvdModel = {
    c0F: 3e-12,
    branches: [
      { fsHz: 1.6e7, r1Ohm: 20, c1F: 1e-14 },
      { fsHz: 4.8e7, r1Ohm: 60, c1F: 1e-15 },
    ],
  };
  const textArb = fc.oneof(
    fc.string({ unit: 'binary', maxLength: 300 }),
    fc
      .array(
        fc.constantFrom(
          '\n',
          '\r',
          '\r\n',
          '\u2028',
          '\u2029',
          '\u0085',
          '\v',
          '\f',
          '.control',
          '.endc',
          '.end',
          '.include x',
          '+ R9 1 0 1',
          'R9 1 0 1',
          '*/',
          '/*',
          '$',
          ';',
          '\\',
          '\u202e',
          '\u0000',
          'shell rm -rf /',
          ' ',
        ),
        { maxLength: 20 },
      )
      .map((a) => a.join('')),
  );
  it("keeps every piece of user text inside `*` comment lines, with only the model's elements outside them", () => {
    fc.assert(
      fc.property(textArb, textArb, textArb, textArb, textArb, (title, kind, sample, date, method) => {
        counter.tick('netlist-comment');
        const info: NetlistInfo = {
          partId: title,
          title,
          kind,
          sample,
          date,
          method,
          validSpanHz: { min: 1e7, max: 5e7 },
        };
        expectOnlyModelLines(formatNetlist(model, info), 2);
        expectOnlyModelLines(formatNetlist(model, { ...info, lotMedianOf: 3, subcktName: title }), 2);
      }),
      { seed: FUZZ_SEED, numRuns: 1500 },
    );
  });
});

describe('notes Markdown holds any text', () => {
  const mdArb = fc
    .array(
      fc.constantFrom(
        '<script>',
        '</script>',
        '<img src=x onerror=alert(1)>',
        'javascript:alert(1)',
        'JaVaScRiPt:',
        'data:text/html,',
        '[',
        ']',
        '(',
        ')',
        '](',
        '*',
        '**',
        '_',
        '`',
        '"',
        "'",
        '=',
        '&',
        '&#58;',
        '&colon;',
        ' ',
        '\n',
        '\n\n',
        '- ',
        '1. ',
        'https://example.com',
        '//evil.example',
        '/rel',
        '#frag',
        '\\',
        '\t',
        'x',
        'onmouseover=',
        '<',
        '>',
      ),
      { maxLength: 40 },
    )
    .map((a) => a.join(''));
  it('renders only the allowed tags and safe links, whatever the notes hold', () => {
    fc.assert(
      fc.property(mdArb, (md) => {
        counter.tick('notes-markdown');
        expectOnlyAllowedTags(renderMarkdown(md));
      }),
      { seed: FUZZ_SEED, numRuns: 3000 },
    );
  });

  it('renders the hostile notes with their markup as text and the one safe link as a link', () => {
    const html = renderMarkdown(HOSTILE.notes);
    expectOnlyAllowedTags(html);
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).toContain('<a href="https://example.com/a?b&#61;1&amp;c&#61;2" rel="noopener noreferrer">ok</a>');
    expect(html).toContain('[click](javascript:alert(1))');
    expect(html).not.toContain('href="javascript');
  });
});

describe('HOSTILE-1 through the pipeline', () => {
  let loaded: LoadedPart;
  let result: PartResult;
  let downloads: DownloadFile[];
  beforeAll(async () => {
    loaded = await loadPart(PART_DIR);
    expect(loaded.issues.filter((i) => i.severity === 'error')).toEqual([]);
    result = extractPart(loaded.part!, loaded.sweeps);
    downloads = makeDownloads(loaded, result);
  });

  it('is a valid record whose text fields come back exactly as written', () => {
    const p = loaded.part!;
    expect([p.title, p.supplier, p.supplierPart, p.package, p.notes]).toEqual([
      HOSTILE.title,
      HOSTILE.supplier,
      HOSTILE.supplierPart,
      HOSTILE.package,
      HOSTILE.notes,
    ]);
    expect([p.samples[0].lot, p.samples[0].by, p.samples[0].instrument]).toEqual([
      HOSTILE.lot,
      HOSTILE.by,
      HOSTILE.instrument,
    ]);
    expect(p.samples[0].sweeps.map((s) => s.file)).toEqual([PORTABLE_NAMES.narrow, PORTABLE_NAMES.wide]);
    expect(result.samples[0].modes.length).toBeGreaterThan(0);
  });

  it("writes netlists whose only non-comment lines are the model's elements", () => {
    const nets = downloads.filter((d) => d.name.endsWith('.cir'));
    expect(nets.map((d) => d.name).sort()).toEqual(['HOSTILE-1-main.cir', 'HOSTILE-1.cir']);
    for (const n of nets) {
      const lines = spiceLines(n.content);
      expect(lines.filter((l) => l.kind === 'comment').some((l) => l.line.includes('<script>alert(1)</script>'))).toBe(
        true,
      );
      expect(lines.filter((l) => l.kind !== 'comment').every((l) => !/control|shell|endc/.test(l.line))).toBe(true);
    }
  });

  it('prints the same safe netlist from the netlist command', async () => {
    let out = '';
    const code = await main(['netlist', PART_DIR], { out: (t) => void (out += t), err: () => undefined });
    expect(code).toBe(0);
    expect(out).toBe(downloads.find((d) => d.name === 'HOSTILE-1.cir')!.content);
  });

  it('keeps the title inside `!` comment lines of the model Touchstone, which reads back', () => {
    const ts = downloads.find((d) => d.name.endsWith('-model.s1p'))!;
    for (const line of ts.content.trimEnd().split('\n'))
      expect(line).toMatch(/^(!.*|# Hz S RI R 50|[-+0-9.e]+( [-+0-9.eE]+){2})$/);
    const back = parseTouchstone(ts.content, ts.name);
    expect(back.comments.some((c) => c.includes('<script>alert(1)</script>'))).toBe(true);
  });

  it('offers the raw record and sweeps byte for byte, under their own names', () => {
    const raw = downloads.filter((d) => d.name.startsWith('raw/'));
    expect(raw.map((d) => d.name).sort()).toEqual(
      ['raw/part.yaml', `raw/${PORTABLE_NAMES.narrow}`, `raw/${PORTABLE_NAMES.wide}`].sort(),
    );
    for (const d of raw) expect(d.content).toBe(readFileSync(join(PART_DIR, d.name.slice(4)), 'utf8'));
  });

  it("keeps the text unchanged in the page data (escaping is the page's job) and in valid JSON", () => {
    const data = makePartData(loaded, result, [], { downloads });
    const back = JSON.parse(JSON.stringify(data));
    const text = JSON.stringify(back);
    for (const s of [HOSTILE.title, HOSTILE.supplier, HOSTILE.supplierPart])
      expect(text).toContain(JSON.stringify(s).slice(1, -1));
    expect(back.id).toBe('HOSTILE-1');
  });

  it.skipIf(!requireTool('ngspice'))(
    'ngspice runs the netlist as a plain subcircuit: no break-out line executes (a shell marker is never written)',
    () => {
      const dir = mkdtempSync(join(tmpdir(), 'motional-hostile-spice-'));
      try {
        // a title that would run a shell command in a `.control` block if it left its comment line
        const title = 'x\n.control\nshell touch pwned-marker\n.endc\n.end\n* */ +R9 1 0 1';
        const netlist = formatNetlist(result.samples[0].model, {
          partId: 'HOSTILE-1',
          title,
          kind: title,
          sample: title,
          date: title,
          method: title,
        });
        expectOnlyModelLines(netlist, result.samples[0].model.branches.length);
        const deck = [
          '* hostile netlist check',
          netlist.trimEnd(),
          `XDUT in 0 ${/^\.subckt (\S+)/m.exec(netlist)![1]}`,
          'V1 in 0 dc 0 ac 1',
          '.ac lin 5 15.9e6 15.92e6',
          '.control',
          'run',
          'let z = -v(in)/i(v1)',
          'wrdata z.out z',
          'quit',
          '.endc',
          '.end',
          '',
        ].join('\n');
        writeFileSync(join(dir, 'deck.cir'), deck);
        execFileSync('ngspice', ['-b', 'deck.cir'], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'], timeout: 60_000 });
        expect(existsSync(join(dir, 'pwned-marker'))).toBe(false);
        expect(readdirSync(dir).sort()).toEqual(['deck.cir', 'z.out']);
        const rows = readFileSync(join(dir, 'z.out'), 'utf8').trim().split('\n');
        expect(rows).toHaveLength(5);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
  );
});
