// Each test file gets a database of its own on the throwaway cluster that `npm test`
// starts (TEST_DATABASE_URL points at its `postgres` database).
import { randomBytes } from 'node:crypto';
import pg from 'pg';

export function testClusterUrl(): string {
  const url = process.env.TEST_DATABASE_URL;
  if (!url) {
    throw new Error('TEST_DATABASE_URL is not set: run the suite with `npm test`, which starts a throwaway PostgreSQL');
  }
  return url;
}

async function admin<T>(work: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: testClusterUrl() });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

export interface TestDatabase {
  url: string;
  drop(): Promise<void>;
}

export async function createTestDatabase(): Promise<TestDatabase> {
  const name = `t_${randomBytes(6).toString('hex')}`;
  await admin((client) => client.query(`CREATE DATABASE ${name}`));
  const url = new URL(testClusterUrl());
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    drop: () => admin((client) => client.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)).then(() => undefined),
  };
}
