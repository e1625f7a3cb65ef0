import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../server/models';
import { demoAccounts, seedDemo } from '../../server/seed';
import { startTestApp, type TestApp } from '../helpers/test-app';

let app: TestApp;

beforeAll(async () => {
  app = await startTestApp({ seed: false });
});
afterAll(async () => {
  await app?.close();
});

describe('seedDemo', () => {
  it('creates the three demo accounts once and is idempotent', async () => {
    const sequelize = app.server.context.database.sequelize;
    expect(await seedDemo(sequelize)).toBe('seeded');
    expect(await seedDemo(sequelize)).toBe('already-seeded');
    const users = await User.findAll();
    expect(users.map((user) => user.email).sort()).toEqual(demoAccounts.map((account) => account.email).sort());
  });

  it('refuses a database that holds people other than the demo accounts', async () => {
    const sequelize = app.server.context.database.sequelize;
    await User.create({ id: randomUUID(), email: 'real.person@lab.example', name: 'Real Person', role: 'lead', status: 'active', passwordHash: null, lastSignInAt: null });
    await expect(seedDemo(sequelize)).rejects.toThrow(/refuses to run.*real.person@lab.example/);
  });
});
