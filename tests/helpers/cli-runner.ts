// `rejectra <command> …` as a child process for the CLI tests: `node --import tsx cli/main.ts`
// from the repository root, as `npm run cli` runs it.
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../..', import.meta.url));

/** How a run ended: its exit code (null when a signal or the timeout stopped it) and all it wrote. */
export interface CliRun {
  status: number | null;
  stdout: string;
  stderr: string;
}

export interface CliRunOptions {
  /** Variables set (or, as '', emptied) on top of this process's environment. */
  env?: NodeJS.ProcessEnv;
}

/**
 * Runs `rejectra <command> …args` to its end and resolves with its exit code, stdout and stderr
 * (several may run side by side). A run still going after a minute, the tests' own timeout, is
 * stopped.
 */
export function runCli(command: string, args: readonly string[], options: CliRunOptions = {}): Promise<CliRun> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'cli/main.ts', command, ...args], {
      cwd: root,
      env: { ...process.env, ...options.env },
      timeout: 60_000,
    });
    let stdout = '';
    let stderr = '';
    // Decoded as a stream, so a character split between two chunks stays whole.
    child.stdout.setEncoding('utf8');
    child.stderr.setEncoding('utf8');
    child.stdout.on('data', (chunk: string) => (stdout += chunk));
    child.stderr.on('data', (chunk: string) => (stderr += chunk));
    child.on('error', reject);
    child.on('close', (status) => resolve({ status, stdout, stderr }));
  });
}
