/**
 * What one sample of a run is called in the reports, and what its time axis means: frames on the
 * video clock for `analyze`, photos for `stills` (result.source "stills"), whose trace time is
 * either seconds after the first photo (EXIF capture times, options.timeBasis
 * "exif-capture-time") or the photo's position in name order (options.timeBasis "photo-index").
 * Shared by the run report, its time-trace plot and summary.md so they use the same words. Pure;
 * never throws.
 * @example sampleWords(stillsResult).timeAxis === 'photo order' (when the photos carry no capture times)
 */
import type { RunResult } from '../result/schema.js';
import { SERIES } from './plots/plotStyle.js';

export interface SampleWords {
  /** "frame" or "photo". */
  one: string;
  /** "frames" or "photos". */
  many: string;
  /** What the trace's time is, in running text: "video time", "seconds after the first photo" or "photo order". */
  timeAxis: string;
  /** The time axis title of a plot, with its unit. */
  axisTitle: string;
  /** Legend label of the points left out of the fit: "excluded frame" (SERIES.excluded) or "excluded photo". */
  excludedLabel: string;
}

export function sampleWords(r: Pick<RunResult, 'source' | 'options'>): SampleWords {
  if (r.source !== 'stills') return { one: 'frame', many: 'frames', timeAxis: 'video time', axisTitle: 'video time (s)', excludedLabel: SERIES.excluded.label };
  const photo = { one: 'photo', many: 'photos', excludedLabel: 'excluded photo' };
  if (r.options.timeBasis === 'exif-capture-time') return { ...photo, timeAxis: 'seconds after the first photo', axisTitle: 'seconds after the first photo (s)' };
  return { ...photo, timeAxis: 'photo order', axisTitle: 'photo order (0 = first photo by name)' };
}
