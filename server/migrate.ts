// Schema migrations (umzug over Sequelize), recorded in the `schema_migrations` table.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';

const migrationsDir = path.join(path.dirname(fileURLToPath(import.meta.url)), 'migrations');

export function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: {
      glob: ['[0-9]*.ts', { cwd: migrationsDir }],
      resolve: ({ name, path: filePath, context }) => ({
        name: name.replace(/\.ts$/, ''),
        up: async () => (await import(filePath!)).up({ context }),
        down: async () => (await import(filePath!)).down({ context }),
      }),
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

/** Applies every pending migration; returns their names. */
export async function migrateToLatest(sequelize: Sequelize): Promise<string[]> {
  const applied = await migrator(sequelize).up();
  return applied.map((migration) => migration.name);
}
