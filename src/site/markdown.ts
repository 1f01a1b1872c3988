/**
 * A deliberately small Markdown subset turned into safe HTML, for the free-text `notes` of a
 * part record. Supported: paragraphs (blank-line separated), `*em*`/`_em_`, `**strong**`,
 * `` `code` ``, bullet (`-`, `*`, `+`) and numbered (`1.`) lists, and `[text](url)` links whose
 * URL is http(s) or relative. Everything else — raw HTML, images, headings, other URL schemes,
 * attributes — comes out as escaped text. The output is the only string a page inserts with
 * `set:html`, so every character of user text passes through {@link escapeHtml} first.
 */

import { MARKDOWN_LINK as LINK } from '../lib/report/notes-excerpt.ts';

export { excerptMarkdown } from '../lib/report/notes-excerpt.ts';

const HTML_ESCAPES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
  '`': '&#96;',
  '=': '&#61;',
};

/** Escape text for use in HTML element content or a double-quoted attribute value. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"'`=]/g, (c) => HTML_ESCAPES[c]);
}

/**
 * True for URLs a note may link to: absolute http(s) URLs, and relative paths or fragments
 * (no scheme, not protocol-relative). Control characters and whitespace make a URL unsafe.
 */
export function isSafeUrl(url: string): boolean {
  if (url.length === 0 || url.length > 2000) return false;
  if (/[\u0000-\u0020\u007f-\u009f\\]/.test(url)) return false;
  if (/^https?:\/\/[^/?#]/i.test(url)) return true;
  if (url.startsWith('//')) return false;
  // Relative: a ':' before the first '/', '?' or '#' would make it a scheme.
  const head = url.split(/[/?#]/, 1)[0];
  return !head.includes(':');
}

/** Inline spans: code first (its content is literal), then links, then emphasis on escaped text. */
function renderInline(text: string): string {
  const parts = text.split(/(`[^`\n]+`)/);
  return parts
    .map((part, i) => (i % 2 === 1 ? `<code>${escapeHtml(part.slice(1, -1))}</code>` : renderLinks(part)))
    .join('');
}

function renderLinks(text: string): string {
  let out = '';
  let last = 0;
  for (const m of text.matchAll(LINK)) {
    out += renderEmphasis(escapeHtml(text.slice(last, m.index)));
    const [whole, label, url] = m;
    out += isSafeUrl(url)
      ? `<a href="${escapeHtml(url)}" rel="noopener noreferrer">${renderEmphasis(escapeHtml(label))}</a>`
      : renderEmphasis(escapeHtml(whole));
    last = m.index + whole.length;
  }
  return out + renderEmphasis(escapeHtml(text.slice(last)));
}

/** Emphasis on already-escaped text: the markers `*` and `_` are never escaped, tags are ours. */
function renderEmphasis(escaped: string): string {
  return escaped
    .replace(/\*\*(?=\S)([^*]*?\S)\*\*/g, '<strong>$1</strong>')
    .replace(/\*(?=\S)([^*]*?\S)\*/g, '<em>$1</em>')
    .replace(/(^|[^\w])_(?=\S)([^_]*?\S)_(?!\w)/g, '$1<em>$2</em>');
}

const BULLET = /^\s{0,3}[-*+]\s+(.*)$/;
const NUMBERED = /^\s{0,3}\d{1,9}[.)]\s+(.*)$/;

/**
 * Render the Markdown subset to HTML. Safe to insert as HTML: user text is always escaped,
 * and the only tags produced are p, ul, ol, li, em, strong, code and a (with a checked href).
 */
export function renderMarkdown(source: string): string {
  const lines = source.replace(/\r\n?/g, '\n').split('\n');
  const blocks: string[] = [];
  let para: string[] = [];
  let list: { tag: 'ul' | 'ol'; items: string[] } | undefined;
  const flushPara = () => {
    if (para.length) blocks.push(`<p>${renderInline(para.join(' '))}</p>`);
    para = [];
  };
  const flushList = () => {
    if (list)
      blocks.push(`<${list.tag}>${list.items.map((t) => `<li>${renderInline(t)}</li>`).join('')}</${list.tag}>`);
    list = undefined;
  };
  for (const raw of lines) {
    const line = raw.trimEnd();
    const bullet = BULLET.exec(line);
    const numbered = bullet ? null : NUMBERED.exec(line);
    if (line.trim() === '') {
      flushPara();
      flushList();
    } else if (bullet || numbered) {
      const tag = bullet ? 'ul' : 'ol';
      flushPara();
      if (list && list.tag !== tag) flushList();
      list ??= { tag, items: [] };
      list.items.push((bullet ?? numbered)![1]);
    } else if (list && /^\s+\S/.test(raw)) {
      // Continuation line of a list item.
      list.items[list.items.length - 1] += ` ${line.trim()}`;
    } else {
      flushList();
      para.push(line.trim());
    }
  }
  flushPara();
  flushList();
  return blocks.join('\n');
}
