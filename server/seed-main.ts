// `node --import tsx server/seed-main.ts`: migrate, then seed the demo (npm start runs it).
import { loadConfig } from './config';
import { openDatabase } from './db';
import { migrateToLatest } from './migrate';
import { initializeModels } from './models';
import { seedDemo } from './seed';

const database = openDatabase(loadConfig().databaseUrl);
try {
  const applied = await migrateToLatest(database.sequelize);
  initializeModels(database.sequelize);
  const outcome = await seedDemo(database.sequelize);
  process.stdout.write(`database: ${applied.length} migration(s) applied; demo ${outcome === 'seeded' ? 'seeded' : 'already present'}\n`);
} catch (error) {
  process.stderr.write(`seed: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exitCode = 1;
} finally {
  await database.close();
}
