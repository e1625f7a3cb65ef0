// `node --import tsx server/mail/stand-in-main.ts`: the local mail stand-in as one process.
import { loadConfig } from '../config';
import { startMailStandIn } from './local-stand-in';

// The same folder and port the server reads them from.
const config = loadConfig();
const port = Number(new URL(config.smtpUrl).port);
const dir = config.mailStandInDir;
try {
  const standIn = await startMailStandIn({ port, dir });
  process.stdout.write(`mail stand-in: smtp://127.0.0.1:${standIn.port}, keeping messages in ${dir}\n`);
  const stop = () => void standIn.close().then(() => process.exit(0));
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
} catch (error) {
  const reason = error instanceof Error ? error.message : String(error);
  const hint = /EADDRINUSE/.test(reason) ? ` (port ${port} is taken: set MAIL_STAND_IN_PORT to a free one)` : '';
  process.stderr.write(`mail stand-in: ${reason}${hint}\n`);
  process.exit(1);
}
