import { rateLimit } from 'express-rate-limit';
import type { ServerConfig } from '../config';

/** Limits guessing on sign-in and on e-mailed links, per client address. */
export function authRateLimit(config: ServerConfig) {
  return rateLimit({
    windowMs: config.authRateLimit.windowMs,
    limit: config.authRateLimit.limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    message: { error: 'Too many attempts from this address; wait a few minutes and try again' },
  });
}
