import type { Command } from 'commander';

/** Registers the `inspect` command (not yet built). */
export function register(program: Command): void {
  void program;
}
