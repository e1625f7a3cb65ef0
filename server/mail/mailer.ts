// Outgoing mail through nodemailer over SMTP: the local stand-in by default, a real server with SMTP_URL.
import nodemailer from 'nodemailer';

export interface OutgoingMessage {
  to: string;
  subject: string;
  text: string;
}

export interface Mailer {
  send(message: OutgoingMessage): Promise<void>;
  close(): void;
}

export function createMailer(options: { smtpUrl: string; from: string; localStandIn: boolean }): Mailer {
  const url = new URL(options.smtpUrl);
  const transport = nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port || (url.protocol === 'smtps:' ? 465 : 587)),
    secure: url.protocol === 'smtps:',
    auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
    // The stand-in speaks plain SMTP on loopback only.
    ignoreTLS: options.localStandIn,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  });
  return {
    async send(message) {
      await transport.sendMail({ from: options.from, to: message.to, subject: message.subject, text: message.text });
    },
    close() {
      transport.close();
    },
  };
}
