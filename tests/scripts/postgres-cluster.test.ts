import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ClusterError, freePort, startCluster } from '../../scripts/lib/postgres-cluster';

// What `npm start` says when its PostgreSQL cannot start.
const work = mkdtempSync('/tmp/rejectra-cluster-');
chmodSync(work, 0o755);
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('startCluster', () => {
  it('names the taken port and the variable that moves it', async () => {
    const blocker = net.createServer();
    const port = await freePort();
    await new Promise<void>((resolve) => blocker.listen(port, '127.0.0.1', resolve));
    try {
      await expect(startCluster(path.join(work, 'taken'), port)).rejects.toThrow(
        new ClusterError(`Port ${port} on 127.0.0.1 is taken by another program: set PGPORT to a free port (or stop that program)`),
      );
    } finally {
      blocker.close();
    }
  });

  it.skipIf(process.getuid?.() !== 0)('says when the postgres user cannot reach the data folder, and how to fix it', async () => {
    const closed = path.join(work, 'closed');
    const inner = path.join(closed, 'inner');
    await import('node:fs').then((fs) => fs.mkdirSync(inner, { recursive: true }));
    chmodSync(closed, 0o700);
    await expect(startCluster(path.join(inner, 'postgres'), await freePort())).rejects.toThrow(/postgres user cannot reach .*chmod o\+x.*REJECTRA_DATA_DIR.*DATABASE_URL/);
  });

  it('starts, answers and stops a fresh cluster on a free port', async () => {
    const cluster = await startCluster(path.join(work, 'ok'), await freePort());
    try {
      const socket = net.connect({ host: '127.0.0.1', port: cluster.port });
      await new Promise<void>((resolve, reject) => socket.once('connect', resolve).once('error', reject));
      socket.destroy();
    } finally {
      cluster.stop();
    }
  });
});
