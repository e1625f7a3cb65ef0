// Tokens for e-mailed links: 256 random bits in the link, only their SHA-256 stored.
import { createHash, randomBytes } from 'node:crypto';

export function newLinkToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, tokenHash: hashLinkToken(token) };
}

export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export const linkLifetimeMs = {
  invite: 7 * 24 * 3600_000,
  reset: 60 * 60_000,
} as const;
