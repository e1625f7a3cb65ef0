// `node --import tsx server/main.ts`: the API server as one process (npm start runs it).
import { loadConfig } from './config';
import { startServer } from './server';

const config = loadConfig();
try {
  const running = await startServer(config);
  running.context.logger.info({ url: running.url }, 'Rejectra is listening');
  const stop = async (signal: string) => {
    running.context.logger.info({ signal }, 'stopping');
    await running.close();
    process.exit(0);
  };
  process.once('SIGINT', () => void stop('SIGINT'));
  process.once('SIGTERM', () => void stop('SIGTERM'));
} catch (error) {
  const reason = error instanceof Error ? error.message : String(error);
  const hint = /EADDRINUSE/.test(reason) ? ` (port ${config.port} is taken: set PORT to a free one)` : '';
  process.stderr.write(`rejectra server: ${reason}${hint}\n`);
  process.exit(1);
}
