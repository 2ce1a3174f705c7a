/**
 * The safety section shared by every report: the trade's cautions from src/safety/cautions.ts and
 * the sentence deferring to local codes, safety data sheets and licensed practice. Pure.
 * @example safetyHtml('7').toString().includes('Nitrobenzene') === true
 */
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE } from '../safety/cautions.js';
import { html, type SafeHtml } from './html.js';

export function safetyHtml(sectionNumber: string, guideHref: string): SafeHtml {
  const items = SAFETY_CAUTIONS.map((c) => html`<dt>${c.title}</dt><dd>${c.text}</dd>`);
  return html`<section id="safety"><h2><span class="no">${sectionNumber}</span>Safety</h2>
<div class="safety">
<p>Kerr-cell work combines lethal voltage, stored charge, hazardous liquids and often lasers. Before the next run:</p>
<dl>${items}</dl>
<p class="defer">${SAFETY_DEFERENCE} More in the guide: <a href="${guideHref}">Safety</a>.</p>
</div></section>`;
}
