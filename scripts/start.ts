// The `npm start` orchestration: project-local PostgreSQL (unless DATABASE_URL is set),
// migrations and demo seed, client build, the mail stand-in (unless SMTP_URL is set) and the
// API server, each a child process; Ctrl-C or SIGTERM stops them all, PostgreSQL included.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { defaults, loadConfig } from '../server/config';
import { demoAccounts, demoPassword } from '../server/seed';
import { ClusterError, ensureDatabase, portInUse, startCluster, type Cluster } from './lib/postgres-cluster';

const root = process.cwd();
const say = (line: string) => process.stdout.write(`rejectra: ${line}\n`);
const fail = (line: string): never => {
  process.stderr.write(`rejectra: ${line}\n`);
  process.exit(1);
};

const env: NodeJS.ProcessEnv = { ...process.env };
let cluster: Cluster | null = null;
const children: ChildProcess[] = [];
let stopping = false;

function stopAll(code: number): void {
  if (stopping) return;
  stopping = true;
  say('stopping…');
  for (const child of children) if (child.exitCode === null) child.kill('SIGTERM');
  const waitForChildren = Promise.all(
    children.map((child) => (child.exitCode === null ? new Promise((resolve) => child.once('exit', resolve)) : null)),
  );
  const deadline = new Promise((resolve) => setTimeout(resolve, 8000));
  void Promise.race([waitForChildren, deadline]).then(() => {
    if (cluster) {
      cluster.stop();
      say('PostgreSQL stopped');
    }
    process.exit(code);
  });
}

process.once('SIGINT', () => stopAll(0));
process.once('SIGTERM', () => stopAll(0));

function runStep(label: string, command: string, args: string[]): void {
  say(label);
  const result = spawnSync(command, args, { stdio: 'inherit', env, cwd: root });
  if (result.status !== 0) {
    cluster?.stop();
    fail(`${label} failed (exit ${result.status ?? result.signal})`);
  }
}

function startChild(name: string, script: string): ChildProcess {
  const child = spawn(process.execPath, ['--import', 'tsx', script], { stdio: 'inherit', env, cwd: root });
  child.once('exit', (code, signal) => {
    if (!stopping) {
      process.stderr.write(`rejectra: ${name} exited (${code ?? signal}); stopping the rest\n`);
      stopAll(1);
    }
  });
  children.push(child);
  return child;
}

async function waitForHealth(url: string, timeoutMs: number): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline && !stopping) {
    try {
      const response = await fetch(`${url}/api/health`);
      if (response.ok) return true;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return false;
}

if (!env.DATABASE_URL) {
  const dataDir = path.resolve(root, env.REJECTRA_DATA_DIR || defaults.dataDir, 'postgres');
  const port = Number(env.PGPORT || defaults.postgresPort);
  try {
    say(`PostgreSQL: ${dataDir} on 127.0.0.1:${port}`);
    cluster = await startCluster(dataDir, port);
    await ensureDatabase(cluster.url('postgres'), 'rejectra');
  } catch (error) {
    cluster?.stop();
    fail(error instanceof ClusterError ? error.message : `PostgreSQL: ${(error as Error).message}`);
  }
  env.DATABASE_URL = cluster!.url('rejectra');
}

const config = loadConfig(env, root);
if (await portInUse(config.port)) {
  cluster?.stop();
  fail(`port ${config.port} is taken by another program: set PORT to a free one`);
}
if (config.mailIsLocalStandIn) {
  const smtpPort = Number(new URL(config.smtpUrl).port);
  if (await portInUse(smtpPort)) {
    cluster?.stop();
    fail(`port ${smtpPort} (mail stand-in) is taken by another program: set MAIL_STAND_IN_PORT to a free one`);
  }
}

runStep('migrating and seeding the demo', process.execPath, ['--import', 'tsx', 'server/seed-main.ts']);
// `npm run dev` serves the client from Vite with hot reload instead of building it.
const devMode = process.argv.includes('--dev');
if (!devMode) {
  runStep('building the client', process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn']);
}

if (config.mailIsLocalStandIn) {
  env.MAIL_STAND_IN_DIR = config.mailStandInDir;
  startChild('mail stand-in', 'server/mail/stand-in-main.ts');
}
startChild('server', 'server/main.ts');
if (devMode) {
  const vite = spawn(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), '--host', '127.0.0.1', '--port', '5173', '--strictPort'], {
    stdio: 'inherit',
    env,
    cwd: root,
  });
  vite.once('exit', () => stopAll(0));
  children.push(vite);
}

if (await waitForHealth(config.appUrl, 30_000)) {
  const accounts = demoAccounts.map((account) => `    ${account.email.padEnd(26)} ${account.role}`).join('\n');
  process.stdout.write(
    `\n  Rejectra is running at ${devMode ? 'http://127.0.0.1:5173 (Vite, hot reload; API at ' + config.appUrl + ')' : config.appUrl}\n\n` +
      `  Demo sign-ins (password "${demoPassword}", demo only):\n${accounts}\n\n` +
      (config.mailIsLocalStandIn ? `  Mail goes to the local stand-in; leads read it under Mailbox.\n` : `  Mail goes out through ${new URL(config.smtpUrl).host}.\n`) +
      `  Ctrl-C stops everything.\n\n`,
  );
} else if (!stopping) {
  process.stderr.write('rejectra: the server did not answer /api/health within 30 s\n');
  stopAll(1);
}
