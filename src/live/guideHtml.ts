/**
 * docs/recording-a-run.md as a small HTML page for the live view's meter links, so that
 * "/guide#avoid-clipping" opens the right section without anything from outside the machine.
 * A deliberately small Markdown subset: headings, paragraphs, bullet lists, **bold**, `code`,
 * links to anchors in the same page (other links stay text), and the file's `<a id="…"></a>`
 * anchors. Everything else is escaped text. Pure.
 */
import { escapeHtml } from '../report/escapeHtml.js';

function inline(text: string): string {
  let s = escapeHtml(text);
  s = s.replace(/\*\*([^*]+)\*\*/g, '<strong>$1</strong>');
  s = s.replace(/`([^`]+)`/g, '<code>$1</code>');
  s = s.replace(/\[([^\]]+)\]\((#[a-z0-9-]+)\)/g, '<a href="$2">$1</a>');
  s = s.replace(/\[([^\]]+)\]\(([^)]+)\)/g, '$1');
  return s;
}

export function guideHtml(markdown: string, stylesheetHref: string): string {
  const out: string[] = [];
  let para: string[] = [];
  let list: string[] = [];
  const flush = (): void => {
    if (para.length > 0) out.push(`<p>${inline(para.join(' '))}</p>`);
    if (list.length > 0) out.push(`<ul>${list.map((l) => `<li>${inline(l)}</li>`).join('')}</ul>`);
    para = [];
    list = [];
  };
  for (const raw of markdown.split(/\r?\n/)) {
    const line = raw.trimEnd();
    const anchor = /^<a id="([a-z0-9-]+)"><\/a>$/.exec(line.trim());
    if (anchor) { flush(); out.push(`<a id="${anchor[1]}"></a>`); continue; }
    const heading = /^(#{1,3})\s+(.*)$/.exec(line);
    if (heading) { flush(); const n = heading[1]!.length; out.push(`<h${n}>${inline(heading[2]!)}</h${n}>`); continue; }
    if (line.trim() === '') { flush(); continue; }
    const item = /^\s*[-*]\s+(.*)$/.exec(line);
    if (item) { if (para.length > 0) { const p = para; para = []; out.push(`<p>${inline(p.join(' '))}</p>`); } list.push(item[1]!); continue; }
    if (list.length > 0 && /^\s+/.test(raw)) { list[list.length - 1] += ` ${line.trim()}`; continue; }
    para.push(line.trim());
  }
  flush();
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Recording a run kerrtrace can measure well</title>
<link rel="stylesheet" href="${escapeHtml(stylesheetHref)}"></head><body class="guide"><main>${out.join('\n')}</main></body></html>`;
}
