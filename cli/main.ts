/**
 * The kerrtrace command line. Each command lives in cli/commands/<name>.ts and registers itself
 * on the program; this file only wires them and handles --version.
 */
import { Command, CommanderError } from 'commander';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { locate } from '../src/media/ffmpegPaths.js';
import { reportError } from './action.js';
import { registerCommands } from './commands/index.js';

export function toolVersion(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  for (const p of [join(here, '..', '..', 'package.json'), join(here, '..', 'package.json')]) {
    try {
      const pkg = JSON.parse(readFileSync(p, 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'kerrtrace' && pkg.version) return pkg.version;
    } catch {
      // try the next location
    }
  }
  return 'unknown';
}

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

const program = new Command();
program
  .name('kerrtrace')
  .description('Measure a liquid Kerr cell from camera footage and a voltage log.')
  .option('-V, --version', 'print the tool and ffmpeg versions')
  .showHelpAfterError('(run with --help for usage)')
  .exitOverride();

program.on('option:version', () => {
  process.stdout.write(`${versionText()}\n`);
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
