/**
 * `kerrtrace trace VIDEO --roi x,y,w,h [--roi ...] [--dark-roi x,y,w,h] [--reference-roi x,y,w,h]
 *  [--transfer srgb|bt709|gamma:G|linear] [--out FILE.csv] [--force] [--quiet]`
 *
 * Per-frame linear brightness of each region as CSV (columns in docs/trace-csv.md), to stdout or to
 * a file. Every argument is checked, and the output is checked not to overwrite anything, before
 * the video is decoded (src/io/outputDir.ts checkOutputFile: links resolved, never the input); the
 * file is written to a temporary name and renamed at the end, so a failed run leaves nothing behind.
 */
import type { Command } from 'commander';
import { action } from '../action.js';
import { makeProgress } from '../progress.js';
import { KerrError } from '../../src/errors.js';
import { checkOutputFile, writeOutputFile } from '../../src/io/outputDir.js';
import type { Rect } from '../../src/media/types.js';
import { validateRect } from '../../src/measure/rect.js';
import { parseRectOption, parseTransferOption } from '../optionParsers.js';
import type { TraceOptions } from '../../src/pipeline/trace.js';

interface TraceCliOptions {
  roi?: string[];
  darkRoi?: string;
  referenceRoi?: string;
  transfer?: string;
  out?: string;
  force?: boolean;
  quiet?: boolean;
}

const collect = (value: string, previous: string[] | undefined): string[] => [...(previous ?? []), value];

export function register(program: Command): void {
  program
    .command('trace')
    .description('per-frame linear brightness of one or more regions of a video, as CSV')
    .argument('<video>', 'video file from the camera')
    .option('--roi <x,y,w,h>', 'region to trace, in displayed pixels (repeat for more regions)', collect)
    .option('--dark-roi <x,y,w,h>', 'region with no beam; its level is subtracted from every region')
    .option('--reference-roi <x,y,w,h>', 'region of constant true brightness (grey card) used to correct exposure changes')
    .option('--transfer <curve>', 'camera transfer curve: srgb, bt709, gamma:G or linear (default: from the video\'s tags)')
    .option('--out <file.csv>', 'write the CSV to this file instead of standard output')
    .option('--force', 'replace --out if it exists')
    .option('--quiet', 'no progress bar and no notes')
    .action(action(async (video: string, c: TraceCliOptions) => {
      if (c.roi === undefined || c.roi.length === 0) {
        throw new KerrError('BAD_ARGUMENT', 'no region to trace', { path: '--roi', hint: 'Give at least one --roi x,y,w,h (see `kerrtrace inspect` for the frame size)' });
      }
      const regions: Rect[] = (c.roi ?? []).map((r) => parseRectOption(r, '--roi'));
      const dark = c.darkRoi !== undefined ? parseRectOption(c.darkRoi, '--dark-roi') : undefined;
      const reference = c.referenceRoi !== undefined ? parseRectOption(c.referenceRoi, '--reference-roi') : undefined;
      const transfer = c.transfer !== undefined ? parseTransferOption(c.transfer, '--transfer') : undefined;
      if (c.out !== undefined) checkOutputFile(c.out, c.force === true, [video]);

      // The media layer loads only when the command runs, so that `kerrtrace --help` starts quickly.
      const [{ probeMedia }, { traceVideo }, { regionTraceCsv }] = await Promise.all([
        import('../../src/media/probe.js'),
        import('../../src/pipeline/trace.js'),
        import('../../src/pipeline/regionTraceCsv.js'),
      ]);
      const probe = await probeMedia(video);
      const { width, height } = probe.info;
      regions.forEach((r, k) => validateRect(r, width, height, regions.length > 1 ? `--roi #${k + 1}` : '--roi'));
      if (dark) validateRect(dark, width, height, '--dark-roi');
      if (reference) validateRect(reference, width, height, '--reference-roi');

      const quiet = c.quiet === true;
      const progress = makeProgress('tracing', quiet);
      const opts: TraceOptions = { regions, probe, onProgress: (d, t) => progress.update(d, t) };
      if (dark) opts.dark = dark;
      if (reference) opts.reference = reference;
      if (transfer) opts.decoding = { transfer };
      let trace;
      try {
        trace = await traceVideo(video, opts);
      } finally {
        progress.stop();
      }
      const csv = regionTraceCsv(trace);
      if (c.out !== undefined) {
        writeOutputFile(c.out, csv, c.force === true);
      } else {
        process.stdout.write(csv); // a closed or full stdout is reported once by cli/main.ts (exit 5)
      }
      if (!quiet) {
        for (const note of trace.notes) process.stderr.write(`kerrtrace: note: ${note}\n`);
        if (c.out !== undefined) {
          process.stderr.write(`kerrtrace: wrote ${trace.frames} frames x ${regions.length} region${regions.length > 1 ? 's' : ''} to ${c.out} (${trace.decoding.transfer} transfer, ${trace.decoding.range} range)\n`);
        }
      }
    }));
}
