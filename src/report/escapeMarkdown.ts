/**
 * Makes user text safe inside summary.md and comparison.md, escaping only what Markdown needs:
 * - `<` and `>` become &lt; and &gt;, and `&` becomes &amp;, because Markdown viewers pass raw
 *   HTML and character references through (CommonMark 0.31 §6.6 raw HTML, §2.5 entity
 *   references), so a label like <script> must arrive as text;
 * - a backslash goes before the characters that Markdown would read as formatting or table
 *   structure (\ ` * _ [ ] | #), CommonMark 0.31 §2.4 backslash escapes;
 * - line breaks become spaces, so a value cannot start a new block.
 * Quotes and apostrophes are left alone: they mean nothing to Markdown outside raw HTML, and an
 * HTML entity for them (&#39;) would have its # escaped and show up as "&\#39;" in the file.
 * Never throws; null and undefined become "".
 * @example escapeMarkdown("Ann's cell|b <i>") === "Ann's cell\\|b &lt;i&gt;"
 */
export function escapeMarkdown(text: unknown): string {
  if (text === null || text === undefined) return '';
  const s = typeof text === 'string' ? text : String(text);
  return s
    .replace(/[&<>]/g, (c) => ENTITY[c] ?? c)
    .replace(/[\\`*_[\]|#]/g, (c) => `\\${c}`)
    .replace(/\r?\n|\r/g, ' ');
}

const ENTITY: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;' };
