// The demo: sign-ins for each role and the fictional lab's designs, instruments and measured
// units (server/demo/scenario.ts). Idempotent; refuses a database that has other people in it.
import { randomUUID } from 'node:crypto';
import type { Sequelize, Transaction } from 'sequelize';
import { driveIsHazardous } from '../shared/schemas/bench-sessions';
import type { Role } from '../shared/schemas/users';
import { hashPassword } from './auth/passwords';
import { demoDesigns, demoInstruments, demoSessions } from './demo/scenario';
import { AuditEvent, BenchSession, BenchSessionInstrument, Design, DesignRevision, Instrument, Sweep, User } from './models';
import { insertPoints } from './operations/sweep-points';

export const demoPassword = 'bench-demo';
export const demoAccounts: { email: string; name: string; role: Role }[] = [
  { email: 'lead@rejectra.test', name: 'Maren Okafor', role: 'lead' },
  { email: 'designer@rejectra.test', name: 'Tomas Brandvold', role: 'designer' },
  { email: 'tech@rejectra.test', name: 'Ines Halvorsen', role: 'technician' },
];

export async function seedDemo(sequelize: Sequelize, options: { scenario?: boolean } = {}): Promise<'seeded' | 'already-seeded'> {
  const accounts = await seedDemoAccounts(sequelize);
  const scenario = options.scenario === false ? 'already-seeded' : await seedDemoScenario(sequelize);
  return accounts === 'seeded' || scenario === 'seeded' ? 'seeded' : 'already-seeded';
}

async function seedDemoAccounts(sequelize: Sequelize): Promise<'seeded' | 'already-seeded'> {
  return sequelize.transaction(async (transaction) => {
    const existing = await User.findAll({ transaction, lock: transaction.LOCK.UPDATE });
    const demoEmails = new Set(demoAccounts.map((account) => account.email));
    const others = existing.filter((user) => !demoEmails.has(user.email));
    if (others.length > 0) {
      throw new Error(
        `The demo seed refuses to run: this database has ${others.length} account(s) that are not demo accounts (e.g. ${others[0].email})`,
      );
    }
    if (existing.length === demoAccounts.length) return 'already-seeded';
    const passwordHash = await hashPassword(demoPassword);
    const have = new Set(existing.map((user) => user.email));
    for (const account of demoAccounts.filter((candidate) => !have.has(candidate.email))) {
      await User.create({ id: randomUUID(), ...account, status: 'active', passwordHash, lastSignInAt: null }, { transaction });
    }
    return 'seeded';
  });
}

/** The lab's designs, instruments and measured units, written once, in one transaction. */
async function seedDemoScenario(sequelize: Sequelize): Promise<'seeded' | 'already-seeded'> {
  if (await Design.findOne({ where: { name: demoDesigns[0].design.name } })) return 'already-seeded';
  const users = new Map((await User.findAll()).map((user) => [user.email, user]));
  const lead = users.get('lead@rejectra.test')!;
  const designer = users.get('designer@rejectra.test')!;
  const sessions = demoSessions();
  await sequelize.transaction(async (transaction: Transaction) => {
    const revisionIds = new Map<string, string>();
    for (const { design, revisions } of demoDesigns) {
      const written = await Design.create({ id: randomUUID(), name: design.name, description: design.description, createdById: designer.id }, { transaction });
      let number = 0;
      for (const revision of revisions) {
        number += 1;
        const id = randomUUID();
        await DesignRevision.create(
          { id, designId: written.id, revision: number, label: revision.label, topology: revision.circuit.topology, circuit: revision.circuit, limitMask: revision.limitMask, changeNote: revision.changeNote, createdById: designer.id },
          { transaction },
        );
        revisionIds.set(`${design.name}/${revision.label}`, id);
      }
    }
    const instrumentIds = new Map<string, string>();
    for (const instrument of demoInstruments) {
      const id = randomUUID();
      await Instrument.create({ id, ...instrument, retired: false }, { transaction });
      instrumentIds.set(instrument.serialNumber, id);
    }
    for (const demo of sessions) {
      const operator = users.get(demo.operatorEmail)!;
      const measuredAt = new Date(demo.measuredAt);
      const session = await BenchSession.create(
        {
          id: randomUUID(),
          designRevisionId: revisionIds.get(`${demo.designName}/${demo.revisionLabel}`)!,
          unitSerial: demo.unitSerial,
          fixture: demo.fixture,
          ambientTemperatureC: demo.ambientTemperatureC,
          differentialDrive: demo.differentialDrive,
          commonModeDrive: demo.commonModeDrive,
          hazardousDrive: driveIsHazardous(demo.commonModeDrive),
          notes: demo.notes,
          status: demo.archived ? 'archived' : 'open',
          archivedAt: demo.archived ? new Date(measuredAt.getTime() + 7 * 24 * 3600_000) : null,
          archivedById: demo.archived ? lead.id : null,
          operatorId: operator.id,
          measuredAt,
        },
        { transaction },
      );
      await BenchSessionInstrument.bulkCreate(
        demo.instrumentSerials.map((serial) => ({ benchSessionId: session.id, instrumentId: instrumentIds.get(serial)!, role: '' })),
        { transaction },
      );
      for (const demoSweep of demo.sweeps) {
        const sweep = await Sweep.create(
          {
            id: randomUUID(),
            benchSessionId: session.id,
            mode: demoSweep.mode,
            source: demoSweep.source,
            sourceName: demoSweep.sourceName,
            clientKey: null,
            amplitudeConvention: 'rms',
            state: 'complete',
            createdById: operator.id,
            deletedAt: null,
            deletedById: null,
            deleteReason: null,
          },
          { transaction },
        );
        await insertPoints(sequelize, sweep.id, demoSweep.points, transaction);
      }
      // The records read as made on the day of the measurement, not the day of the seed.
      await sequelize.query('UPDATE bench_sessions SET created_at = $2, updated_at = $2 WHERE id = $1', { bind: [session.id, measuredAt], transaction });
      await sequelize.query(`UPDATE sweeps SET created_at = $2::timestamptz + interval '20 minutes' * (CASE mode WHEN 'differential' THEN 0 ELSE 1 END), updated_at = $2::timestamptz WHERE bench_session_id = $1`, {
        bind: [session.id, measuredAt],
        transaction,
      });
      if (driveIsHazardous(demo.commonModeDrive)) {
        await AuditEvent.create(
          { actorId: operator.id, action: 'hazard-acknowledged', subjectType: 'bench-session', subjectId: session.id, details: { commonModeDrive: demo.commonModeDrive } },
          { transaction },
        );
      }
    }
  });
  return 'seeded';
}
