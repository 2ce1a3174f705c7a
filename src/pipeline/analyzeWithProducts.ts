/**
 * The full analyze job: measure, fit, then the scatter products (maps, regions, scatter figures,
 * events, exposure, hysteresis, conductivity). When the scatter stage finds frames the first fit
 * should not have used (particle passages, exposure jumps), the fit runs again without them on
 * the same measurement; the products are merged into the refitted result.
 */
import type { RunResult, RunEvent } from '../result/schema.js';
import { computeScatterProducts, type ScatterProducts } from './scatterProducts.js';
import { fitMeasuredRun, measureRun, type AnalyzeHooks, type AnalyzeOptions, type AnalyzeOutput } from './analyze.js';

export interface AnalyzeWithProductsOptions {
  baseline?: RunResult;
  /** Skip the maps and scatter figures (faster; the headline figures are unchanged). */
  products?: boolean;
}

export interface AnalyzedRun {
  out: AnalyzeOutput;
  products: ScatterProducts | null;
}

function reasonFor(frame: number, events: RunEvent[]): string {
  let best: RunEvent | undefined;
  for (const e of events) if (e.frameIndex <= frame && (!best || e.frameIndex > best.frameIndex)) best = e;
  return best?.kind ?? 'event';
}

export async function analyzeWithProducts(o: AnalyzeOptions, hooks: AnalyzeHooks, p: AnalyzeWithProductsOptions = {}): Promise<AnalyzedRun> {
  const measured = await measureRun(o, hooks);
  let out = fitMeasuredRun(measured);
  if (p.products === false) return { out, products: null };
  // Maps need a modulation term that varies; a run whose V_π is not identifiable has none. Its
  // figures are already withheld and the run marked not valid, so it is written without maps.
  if (!out.result.identifiable) {
    out.result.warnings.push({ code: 'no-maps', message: 'no maps or scatter figures: the half-wave voltage is not identifiable from this sweep, so the modulation term is unknown' });
    return { out, products: null };
  }
  const products = await computeScatterProducts(out, {
    videoPath: o.videoPath,
    // gains exist only with a reference region (without one they are all 1 and correct nothing)
    ...(o.referenceRoi ? { gain: out.gain } : {}),
    log: out.log,
    ...(p.baseline ? { baseline: p.baseline } : {}),
  });
  if (products.refitExclusions.length > 0) {
    const sorted = [...products.extraEvents].sort((a, b) => a.frameIndex - b.frameIndex);
    const exclusions = new Map(products.refitExclusions.map((f) => [f, reasonFor(f, sorted)] as const));
    out = fitMeasuredRun(measured, exclusions, products.extraEvents);
  } else if (products.extraEvents.length > 0) {
    out.result.events = [...out.result.events, ...products.extraEvents].sort((a, b) => a.frameIndex - b.frameIndex);
  }
  const r = out.result;
  r.scatter = products.scatter;
  if (products.hysteresis) r.hysteresis = products.hysteresis;
  if (products.conductivity) r.conductivity = products.conductivity;
  r.warnings.push(...products.warnings);
  return { out, products };
}
