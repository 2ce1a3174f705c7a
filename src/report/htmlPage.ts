/**
 * The shell of a self-contained report page: doctype, UTF-8, viewport, a Content-Security-Policy
 * that forbids every network request and every script (only inline styles and data: images are
 * allowed), the inlined stylesheet, and the body. The title is escaped. Pure; never throws.
 * @example htmlPage('Run <1>', html`<main></main>`).includes('<title>Run &lt;1&gt;</title>') === true
 */
import { html, trustedHtml, type SafeHtml } from './html.js';
import { REPORT_CSS } from './reportStyles.js';

export const REPORT_CSP = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";

export function htmlPage(title: string, body: SafeHtml): string {
  return html`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${trustedHtml(REPORT_CSP)}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="kerrtrace">
<title>${title}</title>
<style>${trustedHtml(REPORT_CSS)}</style>
</head>
<body>
${body}
</body>
</html>
`.toString();
}
