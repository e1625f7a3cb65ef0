// `node --import tsx server/mail/stand-in-main.ts`: the local mail stand-in as one process.
import { defaults } from '../config';
import { startMailStandIn } from './local-stand-in';

const port = Number(process.env.MAIL_STAND_IN_PORT || defaults.smtpPort);
const dir = process.env.MAIL_STAND_IN_DIR || `${defaults.dataDir}/mail`;
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
