/**
 * Makes user text safe inside summary.md: first `escapeHtml` (Markdown viewers pass raw HTML
 * through, so a label like <script> must arrive as text), then a backslash before the characters
 * that Markdown would read as formatting or table structure (\ ` * _ [ ] | #), and line breaks
 * become spaces so a value cannot start a new block. Source: CommonMark 0.31, §2.4 backslash
 * escapes (any ASCII punctuation may be backslash-escaped). Never throws.
 * @example escapeMarkdown('a|b <i>') === 'a\\|b &lt;i&gt;'
 */
import { escapeHtml } from './escapeHtml.js';

export function escapeMarkdown(text: unknown): string {
  return escapeHtml(text)
    .replace(/[\\`*_[\]|#]/g, (c) => `\\${c}`)
    .replace(/\r?\n|\r/g, ' ');
}
