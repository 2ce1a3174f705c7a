/**
 * `kerrtrace watch [DEVICE]`: a live page on this computer that watches the camera while the
 * cell is set up and swept: the picture with the beam, dark and reference regions, setup meters,
 * the beam's strip chart, the running Kerr fit against a followed voltage log, and recordings that
 * analyze measures as they are. Work lives in src/live/; docs in docs/live.md.
 */
import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import type { Command } from 'commander';
import { action } from '../action.js';
import { KerrError } from '../../src/errors.js';
import { parseNumberOption, parseRectOption, parseWholeNumberOption } from '../optionParsers.js';
import type { Rect } from '../../src/media/types.js';

interface WatchCliOptions {
  source?: string;
  inputFormat?: string;
  demo?: boolean;
  volts?: string;
  lengthMm?: string;
  gapMm?: string;
  effectiveLengthMm?: string;
  polariserAngleDeg?: string;
  roi?: string;
  darkRoi?: string;
  referenceRoi?: string;
  out?: string;
  record?: boolean;
  recordFor?: string;
  host?: string;
  port?: string;
  maxWidth?: string;
  idleS?: string;
}

/** A positive number checked by the shared parser; the live session keeps the text (it repeats it in the analyze command it suggests). */
function positiveText(text: string | undefined, option: string, expected: string): string | null {
  if (text === undefined) return null;
  parseNumberOption(text, option, expected, 'positive');
  return text.trim();
}

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1']);

export function register(program: Command): void {
  program
    .command('watch')
    .description('a live page on this computer: the camera with setup meters, the running Kerr fit, and recordings analyze can measure')
    .argument('[device]', 'camera or stream: a V4L2 device such as /dev/video0, a URL, or what ffmpeg accepts with --input-format', '/dev/video0')
    .option('--source <file>', 'play a video file at its own frame rate as if it were live (no camera needed)')
    .option('--demo', 'play a built-in simulated run with its voltage log (no camera, no logger needed)')
    .option('--input-format <fmt>', 'ffmpeg input format for the device (e.g. v4l2, avfoundation, dshow)')
    .option('--volts <csv>', 'follow this voltage-log CSV as the logger appends to it (same format as analyze --volts)')
    .option('--length-mm <L>', 'electrode length along the beam, mm (for B)')
    .option('--gap-mm <D>', 'electrode gap, mm (for B)')
    .option('--effective-length-mm <LE>', 'effective length including fringe fields, mm')
    .option('--polariser-angle-deg <A>', 'polariser angle to the field, degrees (default 45)')
    .option('--roi <x,y,w,h>', 'beam region in pixels (default: found automatically, or drag one on the page)')
    .option('--dark-roi <x,y,w,h>', 'dark region in pixels (default: the darkest part of the frame)')
    .option('--reference-roi <x,y,w,h>', 'region of constant brightness (a grey card) for the exposure meter')
    .option('--out <dir>', 'folder that receives one run folder per recording (default: kerrtrace-runs)')
    .option('--record', 'start recording at once')
    .option('--record-for <s>', 'with --record: stop the recording after this many seconds')
    .option('--host <address>', 'address to serve the page on (default 127.0.0.1; any other needs the printed access token)')
    .option('--port <n>', 'port (default: a free one)')
    .option('--max-width <px>', 'scale the live picture down to this width for the meters (default 640)')
    .option('--idle-s <s>', 'release the camera after this many seconds with no page open (default 30)')
    .action(action(async (device: string, c: WatchCliOptions) => {
      const lengthMm = positiveText(c.lengthMm, '--length-mm', 'a positive electrode length in mm');
      const gapMm = positiveText(c.gapMm, '--gap-mm', 'a positive electrode gap in mm');
      const effectiveLengthMm = positiveText(c.effectiveLengthMm, '--effective-length-mm', 'a positive effective length in mm');
      const angle = c.polariserAngleDeg === undefined ? 45 : parseNumberOption(c.polariserAngleDeg, '--polariser-angle-deg', 'an angle in degrees');
      const rects: { roi: Rect | null; darkRoi: Rect | null; referenceRoi: Rect | null } = {
        roi: c.roi !== undefined ? parseRectOption(c.roi, '--roi') : null,
        darkRoi: c.darkRoi !== undefined ? parseRectOption(c.darkRoi, '--dark-roi') : null,
        referenceRoi: c.referenceRoi !== undefined ? parseRectOption(c.referenceRoi, '--reference-roi') : null,
      };
      const recordForS = c.recordFor === undefined ? null : parseNumberOption(c.recordFor, '--record-for', 'a positive number of seconds', 'positive');
      if (recordForS !== null && !c.record) throw new KerrError('BAD_ARGUMENT', '--record-for needs --record', { path: '--record-for', hint: 'Add --record, or start recording from the page' });
      const host = c.host ?? '127.0.0.1';
      const port = c.port === undefined ? 0 : parseWholeNumberOption(c.port, '--port', 'a port number from 0 to 65535', 0, 65535);
      const maxWidth = c.maxWidth === undefined ? 640 : parseWholeNumberOption(c.maxWidth, '--max-width', 'a width from 64 to 4096 pixels', 64, 4096);
      const idleS = c.idleS === undefined ? 30 : parseWholeNumberOption(c.idleS, '--idle-s', 'a whole number of seconds from 1 to 86400', 1, 86400);
      if (c.demo && (c.source !== undefined || c.volts !== undefined)) throw new KerrError('BAD_ARGUMENT', '--demo brings its own clip and log', { path: '--demo', hint: 'Leave out --source and --volts with --demo' });

      const [{ sourceSpec, probeSource }, { LiveSession }, { startLiveServer }, { prepareDemoSource }, { replayLog }] = await Promise.all([
        import('../../src/live/liveSource.js'), import('../../src/live/liveSession.js'), import('../../src/live/liveServer.js'),
        import('../../src/live/demoSource.js'), import('../../src/live/replayLog.js'),
      ]);
      const say = (line: string): void => { process.stdout.write(`${line}\n`); };

      let demo: Awaited<ReturnType<typeof prepareDemoSource>> | null = null;
      let voltsPath = c.volts ?? null;
      let spec;
      if (c.demo) {
        say('rendering the demo clip (simulated bench, invented numbers)…');
        demo = await prepareDemoSource();
        voltsPath = join(demo.dir, 'volts-live.csv');
        spec = sourceSpec(demo.clip, { file: true });
      } else if (c.source !== undefined) {
        spec = sourceSpec(c.source, { file: true, ...(c.inputFormat ? { format: c.inputFormat } : {}) });
      } else {
        spec = sourceSpec(device, { file: false, ...(c.inputFormat ? { format: c.inputFormat } : {}) });
      }
      const cleanupDemo = (): void => { demo?.cleanup(); demo = null; };
      let session;
      let server;
      let replay: ReturnType<typeof replayLog> | null = null;
      try {
        const info = probeSource(spec, maxWidth);
        session = new LiveSession({
          spec, info, voltsPath,
          lengthMm: lengthMm ?? demo?.lengthMm ?? null,
          gapMm: gapMm ?? demo?.gapMm ?? null,
          effectiveLengthMm,
          polariserAngleDeg: angle,
          roi: rects.roi, darkRoi: rects.darkRoi, referenceRoi: rects.referenceRoi ?? demo?.referenceRoi ?? null,
          outDir: c.out ?? 'kerrtrace-runs',
          idleS,
          say,
        });
        if (demo) replay = replayLog(demo.volts, voltsPath!, demo.logDelayS);
        await session.start();
        const first = session.snapshot();
        if (first.source.frames === 0 && first.source.problem) {
          throw new KerrError('FFMPEG_FAILED', first.source.problem, { path: spec.input, hint: spec.file ? 'Check that the file plays' : 'Check that the camera is connected and not used by another program' });
        }
        const token = LOOPBACK.has(host) ? null : randomBytes(16).toString('hex');
        server = await startLiveServer({ host, port, token, session });
        session.setClients(0); // the camera is released if no page opens within --idle-s
      } catch (err) {
        replay?.stop();
        await session?.close();
        cleanupDemo();
        throw err;
      }
      say(`kerrtrace watch: ${spec.label} — open ${server.url} in a browser (Ctrl-C stops)`);
      if (host !== '127.0.0.1' && host !== 'localhost' && host !== '::1') say('served beyond this computer: the address above carries the access token; share it only with people at the bench');

      let stopping: Promise<void> | null = null;
      const live = session;
      const srv = server;
      const shutdown = (why: string): Promise<void> => {
        if (stopping) return stopping;
        stopping = (async () => {
          say(`stopping (${why})…`);
          replay?.stop();
          await live.close();
          await srv.close();
          cleanupDemo();
        })();
        return stopping;
      };
      const killNow = (): void => {
        const pid = live.runningPid;
        if (pid) try { process.kill(pid, 'SIGKILL'); } catch { /* gone */ }
      };
      process.on('exit', killNow);
      await new Promise<void>((resolve) => {
        const onSignal = (sig: NodeJS.Signals): void => { void shutdown(sig).then(resolve, resolve); };
        process.once('SIGINT', onSignal);
        process.once('SIGTERM', onSignal);
        process.once('SIGHUP', onSignal);
        if (c.record) {
          void live.startRecording().then(() => {
            if (recordForS !== null) setTimeout(() => { void live.stopRecording().catch((err: unknown) => say(err instanceof Error ? err.message : String(err))); }, recordForS * 1000);
          }).catch((err: unknown) => say(err instanceof KerrError ? `kerrtrace: ${err.oneLine()}` : String(err)));
        }
      });
    }));
}
