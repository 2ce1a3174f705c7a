import type { Command } from 'commander';

/** Registers the `demo` command (not yet built). */
export function register(program: Command): void {
  void program;
}
