// Authentication, role checks and the Origin check, as Express middleware.
import type { RequestHandler } from 'express';
import { roles, type Role } from '../../shared/schemas/users';
import { forbidden, unauthorized } from '../http/errors';
import type { SessionStore, SessionUser } from './session-store';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Locals {
      user: SessionUser;
      sessionId: string;
    }
  }
}

/** Requires a valid session of an active account; sets `response.locals.user`. */
export function authenticate(sessions: SessionStore): RequestHandler {
  return async (request, response, next) => {
    const sessionId = sessions.readSessionId(request.headers.cookie);
    if (!sessionId) return next(unauthorized());
    const validated = await sessions.validate(sessionId);
    if (!validated) {
      response.append('Set-Cookie', sessions.blankCookie());
      return next(unauthorized('Your session has ended; sign in again'));
    }
    if (validated.user.status !== 'active') {
      await sessions.end(sessionId);
      response.append('Set-Cookie', sessions.blankCookie());
      return next(unauthorized('This account is deactivated'));
    }
    if (validated.refreshedCookie) response.append('Set-Cookie', validated.refreshedCookie);
    response.locals.user = validated.user;
    response.locals.sessionId = validated.sessionId;
    next();
  };
}

const rank = (role: Role) => roles.indexOf(role);

/** Lets through people whose role is `minimum` or above (technician < designer < lead). */
export function authorize(minimum: Role): RequestHandler {
  return (_request, response, next) => {
    if (rank(response.locals.user.role) < rank(minimum)) {
      return next(forbidden(`This needs the ${minimum} role; you are signed in as ${response.locals.user.role}`));
    }
    next();
  };
}

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request forgery guard: a state-changing request that carries a
 * session cookie must come from one of our own origins.
 */
export function requireSameOrigin(appUrl: () => string, sessionCookieName: string): RequestHandler {
  return (request, _response, next) => {
    if (safeMethods.has(request.method)) return next();
    if (!request.headers.cookie?.includes(`${sessionCookieName}=`)) return next();
    const origin = request.headers.origin;
    const host = request.headers.host;
    const sameHost = origin !== undefined && host !== undefined && URL.canParse(origin) && new URL(origin).host === host;
    if (origin && (origin === new URL(appUrl()).origin || sameHost)) return next();
    next(forbidden('Request refused: it did not come from a Rejectra page (Origin header missing or foreign)'));
  };
}
