/**
 * The environment for running the real command line in a test that checks its output: the
 * caller's environment without the variables that change what the command prints
 * (KERRTRACE_DEBUG adds stack traces to stderr, see cli/action.ts). Tool locations
 * (KERRTRACE_FFMPEG, KERRTRACE_FFPROBE, PATH) are kept: they choose the program, not the output.
 */
export const OUTPUT_CHANGING_ENV = ['KERRTRACE_DEBUG'] as const;

export function cliEnv(extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = { ...process.env };
  for (const name of OUTPUT_CHANGING_ENV) delete env[name];
  return { ...env, ...extra };
}
