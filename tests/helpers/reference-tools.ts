// Outside reference programs used by the tests: numpy/scipy through python3 and
// ngspice. When one is missing, checks that need it are skipped (and reported as
// skipped by vitest), never passed.
import { execFileSync, spawnSync } from 'node:child_process';

function probe(command: string, args: string[]): boolean {
  const result = spawnSync(command, args, { stdio: 'ignore', timeout: 20_000 });
  return result.status === 0;
}

/** True when `python3 -c "import numpy, scipy"` succeeds. */
export const hasNumpy = probe('python3', ['-c', 'import numpy, scipy']);

/** True when `ngspice` runs in batch mode. */
export const hasNgspice = probe('ngspice', ['--version']);

/**
 * Runs a Python script (numpy/scipy available) with `input` as JSON on stdin and
 * returns its stdout parsed as JSON.
 */
export function runPython<T = unknown>(script: string, input: unknown = null): T {
  const output = execFileSync('python3', ['-c', script], {
    input: JSON.stringify(input),
    maxBuffer: 256 * 1024 * 1024,
    env: { ...process.env },
  });
  return JSON.parse(output.toString('utf8')) as T;
}

/** Runs `ngspice -b netlist` in `cwd`; returns stdout. Throws with stderr on failure. */
export function runNgspice(netlistPath: string, cwd: string): string {
  const result = spawnSync('ngspice', ['-b', netlistPath], { cwd, encoding: 'utf8', timeout: 60_000 });
  if (result.status !== 0) {
    throw new Error(`ngspice failed on ${netlistPath}: ${result.stderr || result.stdout}`);
  }
  return result.stdout;
}
