/**
 * Turns a Vega-Lite spec into an SVG string (vega-lite compiles it to Vega, vega renders it
 * headless with the "none" renderer — no canvas, no browser, no network) and, on request, into a
 * PNG through sharp (librsvg) at 144 dpi so plots stay sharp when printed or zoomed.
 * Coordinates are rounded to 0.01 px to keep the files small.
 * Element ids inside the SVG (clip paths, gradients) are prefixed with `idPrefix` so several
 * plots can live inline in one HTML page without their ids colliding.
 * Compiler and renderer warnings are collected, never printed.
 * Throws a plain Error when the spec does not compile (a programming error, not bad input).
 * @example const { svg } = await renderPlot(spec, 'tt'); svg.startsWith('<svg') === true
 */
import * as vega from 'vega';
import * as vegaLite from 'vega-lite';
import sharp from 'sharp';
import type { VegaLiteSpec } from './plots/plotStyle.js';

export interface RenderedPlot {
  svg: string;
  warnings: string[];
}

export async function renderPlot(spec: VegaLiteSpec, idPrefix: string): Promise<RenderedPlot> {
  const warnings: string[] = [];
  const collect = (...args: unknown[]): void => {
    warnings.push(args.map(String).join(' '));
  };
  const quietLogger = {
    level(): number { return 0; },
    error: collect,
    warn: collect,
    info: (): void => undefined,
    debug: (): void => undefined,
  };
  const compiled = vegaLite.compile(spec as unknown as vegaLite.TopLevelSpec, { logger: quietLogger as never });
  const view = new vega.View(vega.parse(compiled.spec), { renderer: 'none' });
  view.logger({
    level: () => 0,
    error: collect,
    warn: collect,
    info: () => undefined,
    debug: () => undefined,
  } as never);
  try {
    const raw = await view.toSVG();
    return { svg: prefixIds(roundGeometry(raw), idPrefix), warnings };
  } finally {
    view.finalize();
  }
}

/** PNG bytes of an SVG at the given density (dpi; 144 = twice the 72 dpi CSS-pixel size). */
export async function svgToPng(svg: string, density = 144): Promise<Buffer> {
  return sharp(Buffer.from(svg, 'utf8'), { density }).png({ compressionLevel: 9 }).toBuffer();
}

/** Rounds coordinates in geometry attributes to 0.01 px (invisible, and SVGs shrink by about half). */
function roundGeometry(svg: string): string {
  return svg.replace(/\b(transform|d|x|y|x1|x2|y1|y2|width|height|points)="([^"]*)"/g, (_m, name: string, value: string) =>
    `${name}="${value.replace(/-?\d+\.\d{3,}(?:e-?\d+)?/g, (num) => String(Math.round(Number(num) * 100) / 100))}"`);
}

function prefixIds(svg: string, prefix: string): string {
  const safe = prefix.replace(/[^A-Za-z0-9_-]/g, '');
  return svg
    .replace(/\bid="([^"]+)"/g, (_m, id: string) => `id="${safe}-${id}"`)
    .replace(/url\(#([^)]+)\)/g, (_m, id: string) => `url(#${safe}-${id})`)
    .replace(/href="#([^"]+)"/g, (_m, id: string) => `href="#${safe}-${id}"`);
}
