// What a benchmark needs around it: a fresh /tmp folder, a throwaway PostgreSQL cluster in it, and
// the API server as a child process on a seeded database; all of it removed again on exit or Ctrl-C.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import path from 'node:path';
import { freePort, startCluster, type Cluster } from '../../scripts/lib/postgres-cluster';

export interface ScratchServer {
  /** The fresh folder (traversable by the postgres user). */
  workDir: string;
  /** The built client: `given` when it names one (checked), else a production build into the folder. */
  buildClient(given?: string): string;
  /** Starts the cluster in the folder, on `port` or a free one. */
  startCluster(port?: number): Promise<Cluster>;
  /** Seeds the demo on `databaseUrl`, starts server/main.ts with `env` added, resolves with its URL once healthy. */
  startServer(databaseUrl: string, options?: { port?: number; env?: NodeJS.ProcessEnv }): Promise<string>;
  cleanUp(): void;
}

export function createScratchServer(root: string): ScratchServer {
  const workDir = mkdtempSync('/tmp/rejectra-bench-');
  chmodSync(workDir, 0o755);
  let cluster: Cluster | null = null;
  let server: ChildProcess | null = null;

  const scratch: ScratchServer = {
    workDir,
    buildClient(given) {
      const clientDir = path.resolve(given ?? path.join(workDir, 'client'));
      if (!given) {
        const built = spawnSync(path.join(root, 'node_modules', '.bin', 'vite'), ['build', '--outDir', clientDir, '--logLevel', 'warn'], { cwd: root, encoding: 'utf8' });
        if (built.status !== 0) throw new Error(`client build failed: ${built.stderr}`);
      }
      if (!existsSync(path.join(clientDir, 'index.html'))) throw new Error(`no built client in ${clientDir}`);
      return clientDir;
    },
    async startCluster(port) {
      cluster = await startCluster(path.join(workDir, 'pg'), port ?? (await freePort()));
      return cluster;
    },
    async startServer(databaseUrl, options = {}) {
      const port = options.port ?? (await freePort());
      const env = {
        ...process.env,
        DATABASE_URL: databaseUrl,
        PORT: String(port),
        HOST: '127.0.0.1',
        LOG_LEVEL: 'warn',
        SMTP_URL: `smtp://127.0.0.1:${await freePort()}`,
        NODE_ENV: 'production',
        ...options.env,
      };
      const seeded = spawnSync(process.execPath, ['--import', 'tsx', 'server/seed-main.ts'], { cwd: root, env, encoding: 'utf8' });
      if (seeded.status !== 0) throw new Error(`seeding failed: ${seeded.stderr}`);
      server = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], { cwd: root, env, stdio: ['ignore', 'ignore', 'inherit'] });
      const url = `http://127.0.0.1:${port}`;
      const deadline = Date.now() + 30_000;
      for (;;) {
        try {
          if ((await fetch(`${url}/api/health`)).ok) return url;
        } catch {
          // not up yet
        }
        if (Date.now() > deadline) throw new Error('the server did not start within 30 s');
        await new Promise((resolve) => setTimeout(resolve, 100));
      }
    },
    cleanUp() {
      server?.kill('SIGKILL');
      server = null;
      cluster?.stop();
      cluster = null;
      rmSync(workDir, { recursive: true, force: true });
    },
  };
  process.once('SIGINT', () => {
    scratch.cleanUp();
    process.exit(130);
  });
  return scratch;
}
