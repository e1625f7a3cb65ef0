// Runs type-checking, lint, the client build and every vitest suite against a throwaway
// PostgreSQL cluster in a fresh /tmp folder, then prints one line `N passed, N failed`.
// With arguments (`npm test -- tests/server`), runs only vitest with those arguments.
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { ClusterError, freePort, startCluster, type Cluster } from './lib/postgres-cluster';

const root = process.cwd();
const vitestArgs = process.argv.slice(2);
const workDir = mkdtempSync('/tmp/rejectra-test-');
chmodSync(workDir, 0o755);

let passed = 0;
let failed = 0;
let skipped = 0;
let cluster: Cluster | null = null;

function cleanUp(): void {
  cluster?.stop();
  cluster = null;
  rmSync(workDir, { recursive: true, force: true });
}
process.once('SIGINT', () => {
  cleanUp();
  process.exit(130);
});

function check(label: string, command: string, args: string[], env: NodeJS.ProcessEnv = process.env): boolean {
  process.stdout.write(`\n== ${label}\n`);
  const result = spawnSync(command, args, { stdio: 'inherit', cwd: root, env });
  const ok = result.status === 0;
  if (ok) passed += 1;
  else failed += 1;
  process.stdout.write(`== ${label}: ${ok ? 'ok' : `FAILED (exit ${result.status ?? result.signal})`}\n`);
  return ok;
}

const bin = (name: string) => path.join(root, 'node_modules', '.bin', name);

try {
  cluster = await startCluster(path.join(workDir, 'pg'), await freePort());
} catch (error) {
  process.stderr.write(`${error instanceof ClusterError ? error.message : String(error)}\n`);
  cleanUp();
  process.stdout.write('0 passed, 1 failed\n');
  process.exit(1);
}

const clientDir = path.join(workDir, 'client');
const env: NodeJS.ProcessEnv = {
  ...process.env,
  TEST_DATABASE_URL: cluster.url('postgres'),
  // A partial run (with arguments) uses the client that `npm run build` left in dist/client.
  ...(vitestArgs.length === 0 ? { CLIENT_DIR: clientDir } : {}),
  TEST_ARTIFACTS_DIR: path.join(root, 'test-artifacts'),
  NODE_ENV: 'test',
};

if (vitestArgs.length === 0) {
  check('typecheck', bin('tsc'), ['--noEmit', '-p', 'tsconfig.json']);
  check('lint', bin('eslint'), ['.', '--max-warnings', '0']);
  check('client build', bin('vite'), ['build', '--outDir', clientDir, '--logLevel', 'warn']);
}

const reportFile = path.join(workDir, 'vitest.json');
process.stdout.write('\n== vitest\n');
spawnSync(bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${reportFile}`, ...vitestArgs], {
  stdio: 'inherit',
  cwd: root,
  env,
});
if (existsSync(reportFile)) {
  const report = JSON.parse(readFileSync(reportFile, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    numPendingTests: number;
    numTodoTests: number;
    testResults: { status: string; name: string; assertionResults: { status: string }[]; message?: string }[];
  };
  passed += report.numPassedTests;
  failed += report.numFailedTests;
  skipped += report.numPendingTests + report.numTodoTests;
  // A file that fails outside its tests (import, beforeAll) has no failed test to count: count the file.
  for (const file of report.testResults) {
    if (file.status === 'failed' && !file.assertionResults.some((result) => result.status === 'failed')) {
      failed += 1;
      process.stdout.write(`failed to run: ${path.relative(root, file.name)} ${file.message ?? ''}\n`);
    }
  }
} else {
  failed += 1;
  process.stdout.write('vitest wrote no report\n');
}

cleanUp();
process.stdout.write(`\n${passed} passed, ${failed} failed${skipped > 0 ? `, ${skipped} skipped` : ''}\n`);
process.exit(failed > 0 || passed === 0 ? 1 : 0);
