/**
 * The full analyze job: the figures of analyzeRun and, unless products is false (--no-maps), the
 * pictures (maps, regions, halo-to-core ratio), all from one measurement and one fit. Leaving the
 * pictures out changes no other figure (test/pipeline/noMaps.test.ts).
 * @example const { out, products } = await analyzeWithProducts(o, hooks, { products: true })
 */
import type { AnalyzeHooks, AnalyzeOptions } from './analyze.js';
import { runAnalysis, type AnalyzedRun, type RunAnalysisOptions } from './runAnalysis.js';

export type { AnalyzedRun } from './runAnalysis.js';
export type AnalyzeWithProductsOptions = RunAnalysisOptions;

export async function analyzeWithProducts(o: AnalyzeOptions, hooks: AnalyzeHooks, p: AnalyzeWithProductsOptions = {}): Promise<AnalyzedRun> {
  return runAnalysis(o, hooks, p);
}
