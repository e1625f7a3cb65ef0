// The one module that knows the session library (lucia 3, stored in PostgreSQL).
// Routes and middleware use only what this exports, so the library can be replaced here alone.
import { NodePostgresAdapter } from '@lucia-auth/adapter-postgresql';
import { Lucia, TimeSpan } from 'lucia';
import type pg from 'pg';
import type { Role } from '../../shared/schemas/users';
import type { UserStatus } from '../models/user';

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
  status: UserStatus;
}

interface UserRow {
  email: string;
  name: string;
  role: Role;
  status: UserStatus;
}

function createLucia(pool: pg.Pool, secureCookies: boolean) {
  const adapter = new NodePostgresAdapter(pool, { user: 'users', session: 'user_sessions' });
  return new Lucia(adapter, {
    sessionExpiresIn: new TimeSpan(12, 'h'),
    sessionCookie: {
      name: 'rejectra_session',
      attributes: { secure: secureCookies, sameSite: 'lax' },
    },
    getUserAttributes: (row) => ({ email: row.email, name: row.name, role: row.role, status: row.status }),
  });
}

declare module 'lucia' {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: UserRow;
  }
}

export interface ValidatedSession {
  sessionId: string;
  user: SessionUser;
  /** A refreshed cookie to send back, when the session was extended. */
  refreshedCookie: string | null;
}

export interface SessionStore {
  readonly cookieName: string;
  /** Starts a session; returns the Set-Cookie value. */
  create(userId: string): Promise<string>;
  validate(sessionId: string): Promise<ValidatedSession | null>;
  /** Ends one session; returns the Set-Cookie value that clears the cookie. */
  end(sessionId: string): Promise<string>;
  /** Ends every session a person has (deactivation, password reset). */
  endAllFor(userId: string): Promise<void>;
  /** Reads the session id from a Cookie header. */
  readSessionId(cookieHeader: string | undefined): string | null;
  blankCookie(): string;
}

export function createSessionStore(pool: pg.Pool, options: { secureCookies: boolean }): SessionStore {
  const lucia = createLucia(pool, options.secureCookies);
  return {
    cookieName: lucia.sessionCookieName,
    async create(userId) {
      const session = await lucia.createSession(userId, {});
      return lucia.createSessionCookie(session.id).serialize();
    },
    async validate(sessionId) {
      const { session, user } = await lucia.validateSession(sessionId);
      if (!session || !user) return null;
      return {
        sessionId: session.id,
        user: { id: user.id, email: user.email, name: user.name, role: user.role, status: user.status },
        refreshedCookie: session.fresh ? lucia.createSessionCookie(session.id).serialize() : null,
      };
    },
    async end(sessionId) {
      await lucia.invalidateSession(sessionId);
      return lucia.createBlankSessionCookie().serialize();
    },
    async endAllFor(userId) {
      await lucia.invalidateUserSessions(userId);
    },
    readSessionId(cookieHeader) {
      return lucia.readSessionCookie(cookieHeader ?? '');
    },
    blankCookie() {
      return lucia.createBlankSessionCookie().serialize();
    },
  };
}
