// Reads what the local mail stand-in kept, newest first.
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import type { MailMessage, MailMessageSummary } from '../../shared/schemas/auth';

const messageIdPattern = /^[0-9]{15}-[0-9a-f]{8}$/;

function addressText(address: AddressObject | AddressObject[] | undefined): string {
  if (!address) return '';
  return (Array.isArray(address) ? address : [address]).map((entry) => entry.text).join(', ');
}

function receivedAt(id: string): string {
  return new Date(Number(id.slice(0, 15))).toISOString();
}

async function parse(dir: string, id: string): Promise<MailMessage> {
  const parsed = await simpleParser(await readFile(path.join(dir, `${id}.eml`)));
  return {
    id,
    to: addressText(parsed.to),
    from: addressText(parsed.from),
    subject: parsed.subject ?? '(no subject)',
    receivedAt: receivedAt(id),
    text: parsed.text ?? '',
    html: typeof parsed.html === 'string' ? parsed.html : null,
  };
}

export async function listMessages(dir: string, limit = 200): Promise<MailMessageSummary[]> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return [];
  }
  const ids = names
    .filter((name) => name.endsWith('.eml'))
    .map((name) => name.slice(0, -4))
    .filter((id) => messageIdPattern.test(id))
    .sort()
    .reverse()
    .slice(0, limit);
  const messages = await Promise.all(ids.map((id) => parse(dir, id)));
  return messages.map(({ id, to, subject, receivedAt: at }) => ({ id, to, subject, receivedAt: at }));
}

/** One message, or null when there is none with that id. */
export async function readMessage(dir: string, id: string): Promise<MailMessage | null> {
  if (!messageIdPattern.test(id)) return null;
  try {
    return await parse(dir, id);
  } catch {
    return null;
  }
}
