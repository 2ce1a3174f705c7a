import { describe, expect, it } from 'vitest';
import { escapeHtml } from '../../src/report/escapeHtml.js';
import { escapeMarkdown } from '../../src/report/escapeMarkdown.js';
import { html, trustedHtml } from '../../src/report/html.js';

// Reference: OWASP Cross Site Scripting Prevention Cheat Sheet, rule #1 (encode & < > " ' for
// HTML element content and quoted attributes); CommonMark 0.31 §2.4 for backslash escapes.
describe('escapeHtml', () => {
  it('encodes the five characters OWASP lists for HTML content and attributes', () => {
    expect(escapeHtml(`<a href="x" title='y'>&</a>`)).toBe('&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;&lt;/a&gt;');
  });

  it('turns a script tag into inert text', () => {
    expect(escapeHtml('<script>alert(1)</script>')).toBe('&lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('does not double-encode through one pass and leaves plain text alone', () => {
    expect(escapeHtml('Kerr cell 5 mm ± 0.1')).toBe('Kerr cell 5 mm ± 0.1');
    expect(escapeHtml('&amp;')).toBe('&amp;amp;');
  });

  it('renders null and undefined as nothing and numbers as text', () => {
    expect(escapeHtml(null)).toBe('');
    expect(escapeHtml(undefined)).toBe('');
    expect(escapeHtml(42)).toBe('42');
  });
});

describe('html template', () => {
  it('escapes every interpolated value unless it is trusted markup', () => {
    const label = '<img src=x onerror=alert(1)>';
    const out = html`<p title="${label}">${label}${trustedHtml('<b>ok</b>')}</p>`.toString();
    expect(out).toBe('<p title="&lt;img src=x onerror=alert(1)&gt;">&lt;img src=x onerror=alert(1)&gt;<b>ok</b></p>');
  });

  it('joins arrays and drops null, undefined and false', () => {
    expect(html`${['<a>', html`<i>x</i>`]}${null}${undefined}${false}`.toString()).toBe('&lt;a&gt;<i>x</i>');
  });
});

describe('escapeMarkdown', () => {
  it('escapes HTML first, then Markdown table and emphasis characters, and folds line breaks', () => {
    expect(escapeMarkdown('a|b <i>*x*</i>\nnext')).toBe('a\\|b &lt;i&gt;\\*x\\*&lt;/i&gt; next');
  });
});
