/**
 * Plain-text excerpt of a part's Markdown notes (the search index shows it). The subset is the
 * one src/site/markdown.ts renders; both read links with {@link MARKDOWN_LINK}.
 */

/** A Markdown link `[text](url)`: group 1 the text, group 2 the URL (bounded, no nesting). */
export const MARKDOWN_LINK = /\[([^\]\n]{1,500})\]\(([^()\s]{1,2000})\)/g;

/** Plain-text excerpt of a note (Markdown markers removed), at most `maxChars` characters. */
export function excerptMarkdown(source: string, maxChars = 160): string {
  const text = source
    .replace(/`([^`\n]+)`/g, '$1')
    .replace(MARKDOWN_LINK, '$1')
    .replace(/\*\*?/g, '')
    .replace(/(^|[^\w])_(?=\S)([^_]*?\S)_(?!\w)/g, '$1$2')
    .replace(/^\s*(?:[-+]|\d+[.)])\s+/gm, '')
    .replace(/\s+/g, ' ')
    .trim();
  return text.length > maxChars ? `${text.slice(0, maxChars - 1).trimEnd()}…` : text;
}
