import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BenchSession, Design, Sweep, User } from '../../server/models';
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
  it('creates the demo accounts and the lab scenario once, and is idempotent', async () => {
    const sequelize = app.server.context.database.sequelize;
    expect(await seedDemo(sequelize)).toBe('seeded');
    const counts = [await Design.count(), await BenchSession.count(), await Sweep.count()];
    expect(await seedDemo(sequelize)).toBe('already-seeded');
    expect([await Design.count(), await BenchSession.count(), await Sweep.count()]).toEqual(counts);
    const users = await User.findAll();
    expect(users.map((user) => user.email).sort()).toEqual(demoAccounts.map((account) => account.email).sort());
  });

  it('seeds a lot of at least 12 units on the bridge board, two revisions, sweeps for every unit, some from captures, one floor-limited', async () => {
    const lead = request.agent(app.url).set('Origin', app.origin);
    await lead.post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password: 'bench-demo' }).expect(200);
    const designs = (await lead.get('/api/designs')).body.designs as { id: string; name: string; revisionCount: number }[];
    const bridge = designs.find((design) => design.name === 'LC-Bridge front-end board HRB-204')!;
    expect(bridge.revisionCount).toBe(2);
    const sessions = (await lead.get(`/api/sessions?designId=${bridge.id}&pageSize=100`)).body;
    const units = new Set(sessions.items.map((item: { unitSerial: string }) => item.unitSerial));
    expect(units.size).toBeGreaterThanOrEqual(12);
    for (const item of sessions.items) expect(item.sweepCounts).toEqual({ differential: 1, commonMode: 1 });
    expect(await Sweep.count({ where: { source: 'captures' } })).toBeGreaterThan(0);

    const floorLimited = sessions.items.find((item: { unitSerial: string }) => item.unitSerial === 'HRB204-0012');
    const analysis = (await lead.get(`/api/sessions/${floorLimited.id}/analysis`)).body.analysis;
    expect(analysis.status).toBe('complete');
    const bounds = analysis.points.filter((point: { lowerBound: boolean }) => point.lowerBound);
    expect(bounds.length).toBeGreaterThan(0);
    // Floor-limited at low frequency: the bounds are the lowest frequencies.
    expect(bounds[0].frequencyHz).toBe(analysis.points[0].frequencyHz);
  });

  it('refuses a database that holds people other than the demo accounts', async () => {
    const sequelize = app.server.context.database.sequelize;
    await User.create({ id: randomUUID(), email: 'real.person@lab.example', name: 'Real Person', role: 'lead', status: 'active', passwordHash: null, lastSignInAt: null });
    await expect(seedDemo(sequelize)).rejects.toThrow(/refuses to run.*real.person@lab.example/);
  });
});
