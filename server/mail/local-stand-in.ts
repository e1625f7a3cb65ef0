// The local stand-in for a mail service: an SMTP server on loopback that keeps every
// message it receives as an .eml file, so development and tests can read them.
import { randomBytes } from 'node:crypto';
import { mkdir, rename, writeFile } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';

export interface MailStandIn {
  port: number;
  close(): Promise<void>;
}

const maximumMessageBytes = 5 * 1024 * 1024;

export async function startMailStandIn(options: { host?: string; port: number; dir: string }): Promise<MailStandIn> {
  await mkdir(options.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    // The built-in STARTTLS certificate has expired; loopback plain SMTP is enough here.
    disabledCommands: ['STARTTLS', 'AUTH'],
    banner: 'Rejectra local mail stand-in',
    size: maximumMessageBytes,
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', () => {
        if (stream.sizeExceeded) {
          callback(Object.assign(new Error('Message exceeds the size limit'), { responseCode: 552 }));
          return;
        }
        const id = `${Date.now().toString().padStart(15, '0')}-${randomBytes(4).toString('hex')}`;
        const finalPath = path.join(options.dir, `${id}.eml`);
        // Write then rename, so a reader never sees half a message.
        writeFile(`${finalPath}.part`, Buffer.concat(chunks))
          .then(() => rename(`${finalPath}.part`, finalPath))
          .then(() => callback(), callback);
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, options.host ?? '127.0.0.1', () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return {
    port: address.port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
