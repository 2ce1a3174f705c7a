import { describe, expect, it } from 'vitest';
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE } from '../../src/safety/cautions.js';
import { safetyHtml } from '../../src/report/safetyHtml.js';

// The cautions the design brief requires (common practice of high-voltage, chemical and laser work).
describe('safety cautions', () => {
  const all = SAFETY_CAUTIONS.map((c) => `${c.title} ${c.text}`).join(' ');

  it('cover lethal voltage, stored charge, ozone, toxic and flammable liquids and lasers', () => {
    expect(all).toMatch(/kill/);
    expect(all).toMatch(/hold charge after the supply is off/);
    expect(all).toMatch(/ozone/);
    expect(all).toMatch(/Nitrobenzene is poisonous and is absorbed through the skin/);
    expect(all).toMatch(/flammable/);
    expect(all).toMatch(/harm eyes and camera sensors/);
  });

  it('defer to local codes, safety data sheets and licensed practice', () => {
    expect(SAFETY_DEFERENCE).toMatch(/local electrical and laser-safety codes/);
    expect(SAFETY_DEFERENCE).toMatch(/safety data sheet/);
    expect(SAFETY_DEFERENCE).toMatch(/licensed professional/);
  });

  it('only ever mention exceeding a rating to forbid it', () => {
    const mentions = all.match(/[^.]*\bexceed[^.]*/gi) ?? [];
    expect(mentions.length).toBeGreaterThan(0);
    for (const m of mentions) expect(m).toMatch(/\bNever exceed\b/);
  });

  it('are all shown in the report section', () => {
    const out = safetyHtml('9', 'guide.md#safety').toString();
    for (const c of SAFETY_CAUTIONS) expect(out).toContain(c.title);
    expect(out).toContain('href="guide.md#safety"');
  });
});
