// Personal access tokens for bench programs: `rjt_` + 256 random bits, only the SHA-256 stored.
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { AccessToken, User } from '../models';
import type { SessionUser } from './session-store';

const tokenPrefix = 'rjt_';

export function newAccessToken(): { token: string; tokenHash: string; displayPrefix: string } {
  const token = `${tokenPrefix}${randomBytes(32).toString('base64url')}`;
  return { token, tokenHash: hashAccessToken(token), displayPrefix: token.slice(0, 10) };
}

export function hashAccessToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export async function createAccessToken(userId: string, name: string): Promise<{ record: AccessToken; token: string }> {
  const { token, tokenHash, displayPrefix } = newAccessToken();
  const record = await AccessToken.create({ id: randomUUID(), userId, name, tokenHash, tokenPrefix: displayPrefix, lastUsedAt: null, revokedAt: null });
  return { record, token };
}

export type TokenCheck = { ok: true; user: SessionUser; tokenId: string } | { ok: false; reason: string };

/** Who a bearer token belongs to, if it is valid, not revoked, and its owner is active. */
export async function authenticateAccessToken(token: string, now: Date): Promise<TokenCheck> {
  if (!token.startsWith(tokenPrefix) || token.length > 200) return { ok: false, reason: 'The access token is malformed' };
  const record = await AccessToken.findOne({ where: { tokenHash: hashAccessToken(token) }, include: [{ model: User, as: 'user' }] });
  if (!record || !record.user) return { ok: false, reason: 'The access token is not known' };
  if (record.revokedAt) return { ok: false, reason: `The access token "${record.name}" was revoked` };
  if (record.user.status !== 'active') return { ok: false, reason: 'The account that owns this access token is not active' };
  record.lastUsedAt = now;
  await record.save();
  const { id, email, name, role, status } = record.user;
  return { ok: true, user: { id, email, name, role, status }, tokenId: record.id };
}
