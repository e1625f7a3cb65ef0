import { z } from 'zod';
import { shortText } from './common';

export const createTokenSchema = z.object({ name: shortText('Token name', 80) });

export interface AccessTokenSummary {
  id: string;
  name: string;
  /** The first characters, so a person can tell tokens apart. */
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

/** Returned once, at creation: the only time the token itself is shown. */
export interface CreatedAccessToken extends AccessTokenSummary {
  token: string;
}
