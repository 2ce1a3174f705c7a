import { describe, expect, it } from 'vitest';
import { escapeMarkdown } from '../../src/report/escapeMarkdown.js';

// Reference: CommonMark 0.31 — §2.4 backslash escapes (any ASCII punctuation), §2.5 entity
// references (start with &), §6.6 raw HTML (starts with <).
describe('escapeMarkdown', () => {
  it('leaves apostrophes and quotes as they are: they mean nothing to Markdown outside raw HTML', () => {
    expect(escapeMarkdown("Ann's cell")).toBe("Ann's cell");
    expect(escapeMarkdown('the "clean" run')).toBe('the "clean" run');
    expect(escapeMarkdown("Ann's cell")).not.toContain('&');
  });

  it('keeps raw HTML and entity references inert: < > & become entities', () => {
    expect(escapeMarkdown('<script>x</script>')).toBe('&lt;script&gt;x&lt;/script&gt;');
    expect(escapeMarkdown('&copy; R&D')).toBe('&amp;copy; R&amp;D');
  });

  it('backslash-escapes table and emphasis characters and folds line breaks', () => {
    expect(escapeMarkdown('a|b *x* _y_ [z] `c` #1 \\')).toBe('a\\|b \\*x\\* \\_y\\_ \\[z\\] \\`c\\` \\#1 \\\\');
    expect(escapeMarkdown('one\ntwo\r\nthree\rfour')).toBe('one two three four');
  });

  it('renders null and undefined as nothing and numbers as text', () => {
    expect(escapeMarkdown(null)).toBe('');
    expect(escapeMarkdown(undefined)).toBe('');
    expect(escapeMarkdown(2.5)).toBe('2.5');
  });
});
