import { describe, expect, it } from 'vitest';
import { escapeHtml, excerptMarkdown, isSafeUrl, renderMarkdown } from '../../src/site/markdown.ts';

// Expected HTML is written by hand from the subset's rules (src/site/markdown.ts module doc);
// the attack strings are common practice test inputs for HTML injection.
describe('renderMarkdown', () => {
  it('escapes a script tag instead of emitting it', () => {
    const html = renderMarkdown('<script>alert(1)</script> second source');
    expect(html).toBe('<p>&lt;script&gt;alert(1)&lt;/script&gt; second source</p>');
    expect(html).not.toContain('<script');
  });

  it('escapes event-handler attributes and raw tags', () => {
    const html = renderMarkdown('<img src=x onerror=alert(1)> and <a href="javascript:alert(1)">x</a>');
    expect(html).not.toMatch(/<img|<a /);
    expect(html).toContain('&lt;img src&#61;x onerror&#61;alert(1)&gt;');
  });

  it('renders links only for http(s) and relative URLs, with rel=noopener', () => {
    expect(renderMarkdown('[guide](https://example.invalid/a?b=1&c=2)')).toBe(
      '<p><a href="https://example.invalid/a?b&#61;1&amp;c&#61;2" rel="noopener noreferrer">guide</a></p>',
    );
    expect(renderMarkdown('[sheet](../docs/sheet.pdf)')).toBe(
      '<p><a href="../docs/sheet.pdf" rel="noopener noreferrer">sheet</a></p>',
    );
    for (const bad of [
      'javascript:alert(1)',
      'JaVaScRiPt:alert(1)',
      'data:text/html,x',
      '//evil.invalid/x',
      'vbscript:x',
    ]) {
      const html = renderMarkdown(`[x](${bad})`);
      expect(html, bad).not.toContain('<a ');
      expect(html, bad).not.toContain('href');
    }
  });

  it('a link label cannot break out of the anchor', () => {
    const html = renderMarkdown('[<b onmouseover=alert(1)>hi</b>](https://example.invalid/)');
    expect(html).toBe(
      '<p><a href="https://example.invalid/" rel="noopener noreferrer">&lt;b onmouseover&#61;alert(1)&gt;hi&lt;/b&gt;</a></p>',
    );
  });

  it('quotes in a URL cannot close the href attribute', () => {
    const html = renderMarkdown('[x](https://example.invalid/"onmouseover="alert(1))');
    expect(html).not.toMatch(/href="[^"]*"\s*onmouseover/);
  });

  it('renders paragraphs, emphasis, strong and code, keeping code literal', () => {
    expect(renderMarkdown('First *em* and **strong**.\n\nSecond `a*b*c <x>` _under_')).toBe(
      '<p>First <em>em</em> and <strong>strong</strong>.</p>\n<p>Second <code>a*b*c &lt;x&gt;</code> <em>under</em></p>',
    );
  });

  it('renders bullet and numbered lists', () => {
    expect(renderMarkdown('Notes:\n- one\n- two <i>\n\n1. first\n2. second')).toBe(
      '<p>Notes:</p>\n<ul><li>one</li><li>two &lt;i&gt;</li></ul>\n<ol><li>first</li><li>second</li></ol>',
    );
  });

  it('does not treat underscores inside words as emphasis', () => {
    expect(renderMarkdown('file a1_narrow_cl10.s2p')).toBe('<p>file a1_narrow_cl10.s2p</p>');
  });
});

describe('helpers', () => {
  it('escapeHtml escapes the five HTML specials plus backtick and equals', () => {
    expect(escapeHtml(`<a href='x' b="y">&\`=`)).toBe(
      '&lt;a href&#61;&#39;x&#39; b&#61;&quot;y&quot;&gt;&amp;&#96;&#61;',
    );
  });

  it('isSafeUrl accepts http(s) and relative, refuses schemes and protocol-relative URLs', () => {
    expect(isSafeUrl('https://example.invalid')).toBe(true);
    expect(isSafeUrl('http://example.invalid/x')).toBe(true);
    expect(isSafeUrl('docs/a.html#x')).toBe(true);
    expect(isSafeUrl('#top')).toBe(true);
    expect(isSafeUrl('mailto:a@b')).toBe(false);
    expect(isSafeUrl('java\tscript:alert(1)')).toBe(false);
    expect(isSafeUrl('//host/x')).toBe(false);
    expect(isSafeUrl('https:/\\host')).toBe(false);
  });

  it('excerptMarkdown strips markup and shortens with an ellipsis', () => {
    expect(excerptMarkdown('**Bold** [link](https://x.invalid) and `code`', 100)).toBe('Bold link and code');
    expect(excerptMarkdown('a'.repeat(50), 10)).toBe(`${'a'.repeat(9)}…`);
  });
});
