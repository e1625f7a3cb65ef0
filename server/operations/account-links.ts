// Invitations and password resets: each writes its rows and sends its e-mail inside one
// transaction, so a failed send leaves nothing behind.
import { randomUUID } from 'node:crypto';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { Role } from '../../shared/schemas/users';
import { hashPassword } from '../auth/passwords';
import { hashLinkToken, linkLifetimeMs, newLinkToken } from '../auth/link-tokens';
import { conflict, gone, HttpError, notFound } from '../http/errors';
import type { Mailer } from '../mail/mailer';
import { invitationMessage, passwordResetMessage } from '../mail/messages';
import { AccountLink, User } from '../models';
import type { AccountLinkPurpose } from '../models/account-link';

export interface LinkContext {
  sequelize: Sequelize;
  mailer: Mailer;
  /** Read at use, since a server started on port 0 learns its address only when listening. */
  config: { appUrl: string };
  now?: () => Date;
}

async function issueLink(
  context: LinkContext,
  user: User,
  purpose: AccountLinkPurpose,
  transaction: Transaction,
): Promise<{ link: string; expiresAt: Date }> {
  const now = context.now?.() ?? new Date();
  // A new link replaces any unused one of the same purpose.
  await AccountLink.update(
    { usedAt: now },
    { where: { userId: user.id, purpose, usedAt: { [Op.is]: null } }, transaction },
  );
  const { token, tokenHash } = newLinkToken();
  const expiresAt = new Date(now.getTime() + linkLifetimeMs[purpose]);
  await AccountLink.create({ id: randomUUID(), userId: user.id, purpose, tokenHash, expiresAt, usedAt: null }, { transaction });
  return { link: `${context.config.appUrl}/link/${token}`, expiresAt };
}

async function sendOrFail(context: LinkContext, send: () => Promise<void>): Promise<void> {
  try {
    await send();
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    throw new HttpError(502, `The e-mail could not be sent (${reason}); nothing was changed`);
  }
}

export async function inviteUser(
  context: LinkContext,
  request: { email: string; name: string; role: Role },
  invitedBy: { name: string },
): Promise<User> {
  return context.sequelize.transaction(async (transaction) => {
    const existing = await User.findOne({ where: { email: request.email }, transaction, lock: transaction.LOCK.UPDATE });
    if (existing) {
      const state = existing.status === 'invited' ? 'has already been invited (resend the invitation instead)' : 'already has an account';
      throw conflict(`${request.email} ${state}`, { email: `${request.email} ${state}` });
    }
    const user = await User.create(
      { id: randomUUID(), email: request.email, name: request.name, role: request.role, status: 'invited', passwordHash: null, lastSignInAt: null },
      { transaction },
    );
    const { link, expiresAt } = await issueLink(context, user, 'invite', transaction);
    await sendOrFail(context, () =>
      context.mailer.send(invitationMessage({ to: user.email, name: user.name, role: user.role, invitedBy: invitedBy.name, link, expiresAt })),
    );
    return user;
  });
}

export async function resendInvitation(context: LinkContext, userId: string, invitedBy: { name: string }): Promise<User> {
  return context.sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('No such person');
    if (user.status !== 'invited') throw conflict(`${user.email} has already set up the account; there is no invitation to resend`);
    const { link, expiresAt } = await issueLink(context, user, 'invite', transaction);
    await sendOrFail(context, () =>
      context.mailer.send(invitationMessage({ to: user.email, name: user.name, role: user.role, invitedBy: invitedBy.name, link, expiresAt })),
    );
    return user;
  });
}

export async function requestPasswordReset(context: LinkContext, email: string): Promise<void> {
  await context.sequelize.transaction(async (transaction) => {
    const user = await User.findOne({ where: { email }, transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound(`No account uses ${email}`);
    if (user.status === 'deactivated') throw conflict(`The account for ${email} is deactivated; ask a lead to reactivate it`);
    if (user.status === 'invited') {
      throw conflict(`${email} has not accepted the invitation yet; use the invitation e-mail, or ask a lead to resend it`);
    }
    const { link, expiresAt } = await issueLink(context, user, 'reset', transaction);
    await sendOrFail(context, () => context.mailer.send(passwordResetMessage({ to: user.email, name: user.name, link, expiresAt })));
  });
}

/** Finds the link a token belongs to and checks that it can still be used. */
async function usableLink(context: LinkContext, token: string, transaction?: Transaction): Promise<{ link: AccountLink; user: User }> {
  const link = await AccountLink.findOne({
    where: { tokenHash: hashLinkToken(token) },
    transaction,
    lock: transaction ? transaction.LOCK.UPDATE : undefined,
  });
  if (!link) throw notFound('This link is not known: check that the whole address was copied from the e-mail');
  if (link.usedAt) {
    throw gone(
      link.purpose === 'invite'
        ? 'This invitation link was already used or replaced by a newer one; sign in, or ask a lead to resend it'
        : 'This reset link was already used or replaced by a newer one; ask for a new one',
    );
  }
  const now = context.now?.() ?? new Date();
  if (link.expiresAt.getTime() <= now.getTime()) {
    throw gone(
      link.purpose === 'invite'
        ? `This invitation expired on ${link.expiresAt.toUTCString()}; ask a lead to resend it`
        : `This reset link expired on ${link.expiresAt.toUTCString()}; ask for a new one`,
    );
  }
  const user = await User.findByPk(link.userId, { transaction });
  if (!user) throw notFound('The account this link was for no longer exists');
  if (user.status === 'deactivated') throw gone('The account this link was for is deactivated; ask a lead');
  return { link, user };
}

export async function describeLink(context: LinkContext, token: string) {
  const { link, user } = await usableLink(context, token);
  return { purpose: link.purpose, email: user.email, name: user.name, expiresAt: link.expiresAt.toISOString() };
}

/**
 * Sets the password from an invitation or reset link, marks the link used and
 * ends every other session of that person. Returns the person, now active.
 */
export async function acceptLink(context: LinkContext, token: string, password: string): Promise<User> {
  const passwordHash = await hashPassword(password);
  return context.sequelize.transaction(async (transaction) => {
    const { link, user } = await usableLink(context, token, transaction);
    const now = context.now?.() ?? new Date();
    link.usedAt = now;
    await link.save({ transaction });
    user.passwordHash = passwordHash;
    user.status = 'active';
    await user.save({ transaction });
    await context.sequelize.query('DELETE FROM user_sessions WHERE user_id = $1', { bind: [user.id], transaction });
    return user;
  });
}
