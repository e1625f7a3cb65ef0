// The start of every command's `run(args)`: its options parsed by node:util's parseArgs, a usage
// error (exit 2) on anything parseArgs refuses, and --help / -h printing the usage (exit 0).
import { parseArgs, type ParseArgsConfig } from 'node:util';

/** A parseArgs configuration whose options include `help: { type: 'boolean', short: 'h' }`. */
type CommandArgsConfig = ParseArgsConfig & { options: { help: { type: 'boolean'; short: 'h' } } };

/**
 * Parses `rejectra <command>`'s arguments with `parseArgs(config)`, typed as that call is. Returns
 * an exit code instead when the command is done: 2 after writing `rejectra <command>: <error>` and
 * `usage` to stderr when parseArgs refuses the arguments, 0 after writing `usage` to stdout for
 * --help.
 */
export function parseCommandArgs<T extends CommandArgsConfig>(command: string, usage: string, config: T): ReturnType<typeof parseArgs<T>> | number {
  let parsed;
  try {
    parsed = parseArgs(config);
  } catch (error) {
    process.stderr.write(`rejectra ${command}: ${(error as Error).message}\n${usage}`);
    return 2;
  }
  // The constraint on T guarantees a boolean `help`; inside this generic TypeScript cannot see it.
  if ((parsed.values as { help?: boolean }).help) {
    process.stdout.write(usage);
    return 0;
  }
  return parsed;
}
