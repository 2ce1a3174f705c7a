/**
 * The kerrtrace command line. Each command lives in cli/commands/<name>.ts and registers itself
 * on the program; this file only wires them and handles --version.
 */
import { Command, CommanderError } from 'commander';
import { locate } from '../src/media/ffmpegPaths.js';
import { writeSync } from 'node:fs';
import { EXIT, reportError, say } from './action.js';
import { guardStdout, installSignalCleanup, stdoutFailureLine } from './guardStreams.js';
import { toolVersion } from './toolVersion.js';
import { registerCommands } from './commands/index.js';

function versionText(): string {
  let ff = 'not found';
  try {
    const f = locate('ffmpeg');
    ff = `${f.version} (${f.path})`;
  } catch {
    // reported as "not found"
  }
  return `kerrtrace ${toolVersion()}\nffmpeg ${ff}`;
}

guardStdout();
installSignalCleanup();

const program = new Command();
program
  .name('kerrtrace')
  .description('Measure a liquid Kerr cell from camera footage and a voltage log.')
  .option('-V, --version', 'print the tool and ffmpeg versions')
  .exitOverride()
  // Usage errors read like every other error: one line, "kerrtrace: ...", with the way out.
  .configureOutput({
    outputError: (text, write) => write(`kerrtrace: ${text.trim().replace(/^error: /, '')}. Run \`kerrtrace --help\` (or COMMAND --help) for usage\n`),
  });

program.on('option:version', () => {
  // Written synchronously so that a closed or full stdout is reported here, in one line.
  try {
    writeSync(1, `${versionText()}\n`);
  } catch (err) {
    say(`${stdoutFailureLine((err as NodeJS.ErrnoException).code)}\n`);
    process.exit(EXIT.environment);
  }
  process.exit(0);
});

registerCommands(program);

try {
  await program.parseAsync(process.argv);
} catch (err) {
  if (err instanceof CommanderError) {
    process.exitCode = err.exitCode === 0 ? 0 : 2;
  } else {
    process.exitCode = reportError(err);
  }
}
