// The demo: sign-ins for each role. Idempotent; refuses a database that has other people in it.
import { randomUUID } from 'node:crypto';
import type { Sequelize } from 'sequelize';
import type { Role } from '../shared/schemas/users';
import { hashPassword } from './auth/passwords';
import { User } from './models';

export const demoPassword = 'bench-demo';
export const demoAccounts: { email: string; name: string; role: Role }[] = [
  { email: 'lead@rejectra.test', name: 'Maren Okafor', role: 'lead' },
  { email: 'designer@rejectra.test', name: 'Tomas Brandvold', role: 'designer' },
  { email: 'tech@rejectra.test', name: 'Ines Halvorsen', role: 'technician' },
];

export async function seedDemo(sequelize: Sequelize): Promise<'seeded' | 'already-seeded'> {
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
