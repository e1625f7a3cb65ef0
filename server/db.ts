// One Sequelize instance and one pg pool (used by the session store) per process.
import pg from 'pg';
import { Sequelize } from 'sequelize';

export interface Database {
  sequelize: Sequelize;
  pool: pg.Pool;
  close(): Promise<void>;
}

export function openDatabase(databaseUrl: string): Database {
  const sequelize = new Sequelize(databaseUrl, {
    dialect: 'postgres',
    logging: false,
    define: { underscored: true },
    pool: { max: 10, idle: 10_000 },
  });
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 5 });
  // An idle client that loses its connection must not take the process down.
  pool.on('error', () => undefined);
  return {
    sequelize,
    pool,
    async close() {
      await Promise.all([sequelize.close(), pool.end()]);
    },
  };
}

/** True when the database answers a trivial query. */
export async function databaseIsUp(database: Database): Promise<boolean> {
  try {
    await database.sequelize.query('SELECT 1');
    return true;
  } catch {
    return false;
  }
}
