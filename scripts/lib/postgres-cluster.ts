// A PostgreSQL cluster run by the project itself from Debian's binaries, on loopback
// TCP only (no Unix socket, so the folder's path length does not matter).
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import pg from 'pg';

export class ClusterError extends Error {}

export function postgresBinDir(): string {
  const root = '/usr/lib/postgresql';
  const versions = existsSync(root)
    ? readdirSync(root)
        .filter((name) => existsSync(path.join(root, name, 'bin', 'pg_ctl')))
        .sort((a, b) => Number(b) - Number(a))
    : [];
  if (versions.length === 0) {
    throw new ClusterError(
      'PostgreSQL binaries are missing (/usr/lib/postgresql/*/bin/pg_ctl): run `apt-get update && apt-get install -y postgresql`, or set DATABASE_URL to an existing server',
    );
  }
  return path.join(root, versions[0], 'bin');
}

const runningAsRoot = process.getuid?.() === 0;

/** Runs a PostgreSQL program as the `postgres` user when we are root (it refuses root). */
function runAsPostgres(program: string, args: string[]): { status: number | null; output: string } {
  const [command, commandArgs] = runningAsRoot ? ['runuser', ['-u', 'postgres', '--', program, ...args]] : [program, args];
  const result = spawnSync(command, commandArgs, { encoding: 'utf8' });
  return { status: result.status, output: `${result.stdout ?? ''}${result.stderr ?? ''}`.trim() };
}

/** True when something already accepts connections on 127.0.0.1:port. */
export function portInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });
}

/** A port the operating system reports free right now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

export interface Cluster {
  dataDir: string;
  port: number;
  /** postgres://postgres@127.0.0.1:PORT/DB */
  url(database: string): string;
  stop(): void;
}

/** Creates the data folder and runs initdb once; says what to do when postgres cannot use the folder. */
function initialize(bin: string, dataDir: string): void {
  if (existsSync(path.join(dataDir, 'PG_VERSION'))) return;
  try {
    mkdirSync(path.dirname(dataDir), { recursive: true, mode: 0o755 });
    mkdirSync(dataDir, { recursive: true, mode: 0o700 });
    if (runningAsRoot) execFileSync('chown', ['-R', 'postgres:postgres', dataDir]);
    execFileSync('chmod', ['700', dataDir]);
  } catch (error) {
    throw new ClusterError(`Cannot create the database folder ${dataDir}: ${(error as Error).message}. Make its parent writable, or set DATABASE_URL`);
  }
  if (runningAsRoot) {
    const probe = spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-w', dataDir]);
    if (probe.status !== 0) {
      throw new ClusterError(
        `The postgres user cannot reach ${dataDir}: a parent folder is not traversable. ` +
          `Run \`chmod o+x\` on each parent folder, set REJECTRA_DATA_DIR to a folder it can reach, or set DATABASE_URL`,
      );
    }
  }
  const result = runAsPostgres(path.join(bin, 'initdb'), ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
  if (result.status !== 0) throw new ClusterError(`initdb failed for ${dataDir}:\n${result.output}`);
}

/**
 * Starts (initialising on first use) a cluster in `dataDir` listening on 127.0.0.1:port.
 * Throws a ClusterError saying what went wrong and how to fix it.
 */
export async function startCluster(dataDir: string, port: number): Promise<Cluster> {
  const bin = postgresBinDir();
  initialize(bin, dataDir);
  if (await portInUse(port)) {
    throw new ClusterError(`Port ${port} on 127.0.0.1 is taken by another program: set PGPORT to a free port (or stop that program)`);
  }
  const logFile = path.join(dataDir, 'server.log');
  const options = `-c listen_addresses=127.0.0.1 -p ${port} -c unix_socket_directories=''`;
  const start = () => runAsPostgres(path.join(bin, 'pg_ctl'), ['-D', dataDir, '-l', logFile, '-w', '-t', '30', '-o', options, 'start']);
  let result = start();
  if (result.status !== 0) {
    // After a hard kill the old postmaster.pid can linger while the process is reaped.
    await new Promise((resolve) => setTimeout(resolve, 2000));
    result = start();
  }
  if (result.status !== 0) {
    const tail = existsSync(logFile) ? readFileSync(logFile, 'utf8').split('\n').slice(-8).join('\n') : '';
    throw new ClusterError(`PostgreSQL did not start in ${dataDir} on port ${port}:\n${result.output}\n${tail}`);
  }
  let stopped = false;
  return {
    dataDir,
    port,
    url: (database) => `postgres://postgres@127.0.0.1:${port}/${database}`,
    stop() {
      if (stopped) return;
      stopped = true;
      runAsPostgres(path.join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', '-t', '30', 'stop']);
    },
  };
}

/** Creates the database when it does not exist yet. */
export async function ensureDatabase(adminUrl: string, name: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    const { rowCount } = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
    if (!rowCount) await client.query(`CREATE DATABASE "${name.replaceAll('"', '')}"`);
  } finally {
    await client.end();
  }
}
