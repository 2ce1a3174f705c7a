import type { Command } from 'commander';
import { register as analyze } from './analyze.js';
import { register as calibrateCamera } from './calibrateCamera.js';
import { register as compare } from './compare.js';
import { register as demo } from './demo.js';
import { register as design } from './design.js';
import { register as inspect } from './inspect.js';
import { register as simulate } from './simulate.js';
import { register as stills } from './stills.js';
import { register as trace } from './trace.js';
import { register as watch } from './watch.js';

/** Registers every command; each command file exports `register(program)`. */
export function registerCommands(program: Command): void {
  demo(program);
  analyze(program);
  inspect(program);
  trace(program);
  simulate(program);
  compare(program);
  stills(program);
  design(program);
  calibrateCamera(program);
  watch(program);
}
