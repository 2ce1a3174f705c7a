/**
 * Escapes text for HTML element content and quoted attribute values: & < > " ' become entities.
 * Every piece of text that did not come from this tool's own templates (labels, notes, file
 * names, paths, option values, warning text) goes through this one function before it reaches
 * report.html or comparison.html (summary.md and comparison.md use escapeMarkdown).
 * Source: the HTML Living Standard's rules for character references (common practice for
 * escaping untrusted text; OWASP XSS prevention rule #1).
 * Non-string values are converted with String() first; null and undefined become "".
 * Never throws.
 * @example escapeHtml('<script>alert(1)</script>') === '&lt;script&gt;alert(1)&lt;/script&gt;'
 */
export function escapeHtml(text: unknown): string {
  if (text === null || text === undefined) return '';
  const s = typeof text === 'string' ? text : String(text);
  return s.replace(/[&<>"']/g, (c) => ENTITY[c] ?? c);
}

const ENTITY: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};
