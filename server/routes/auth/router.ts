import { Router } from 'express';
import {
  forgotPasswordRequestSchema,
  setPasswordRequestSchema,
  signInRequestSchema,
  type SignInRequest,
} from '../../../shared/schemas/auth';
import type { AppContext } from '../../app-context';
import { authenticate } from '../../auth/middleware';
import { passwordMatches } from '../../auth/passwords';
import { badRequest, forbidden, unauthorized } from '../../http/errors';
import { authRateLimit } from '../../http/rate-limits';
import { validateBody } from '../../http/validate';
import { User } from '../../models';
import { acceptLink, describeLink, requestPasswordReset, type LinkContext } from '../../operations/account-links';
import { presentUser } from '../../presenters/user';

export function authRouter(context: AppContext): Router {
  const router = Router();
  const limit = authRateLimit(context.config);
  const links: LinkContext = { sequelize: context.database.sequelize, mailer: context.mailer, config: context.config, now: context.now };

  router.post('/sign-in', limit, validateBody(signInRequestSchema), async (request, response) => {
    const { email, password } = request.body as SignInRequest;
    const user = await User.findOne({ where: { email } });
    if (!user) throw unauthorized(`No account uses ${email}`);
    if (user.status === 'invited' || !user.passwordHash) {
      throw unauthorized(`${email} has not set a password yet: use the link in the invitation e-mail`);
    }
    if (!(await passwordMatches(user.passwordHash, password))) {
      throw unauthorized('Wrong password for this account');
    }
    if (user.status === 'deactivated') throw forbidden('This account is deactivated; ask a lead to reactivate it');
    user.lastSignInAt = context.now();
    await user.save();
    response.append('Set-Cookie', await context.sessions.create(user.id));
    response.json({ user: presentUser(user) });
  });

  router.post('/sign-out', async (request, response) => {
    const sessionId = context.sessions.readSessionId(request.headers.cookie);
    response.append('Set-Cookie', sessionId ? await context.sessions.end(sessionId) : context.sessions.blankCookie());
    response.status(204).end();
  });

  router.get('/me', authenticate(context.sessions), async (_request, response) => {
    const user = await User.findByPk(response.locals.user.id);
    if (!user) throw unauthorized('Your account no longer exists');
    response.json({ user: presentUser(user) });
  });

  router.post('/forgot-password', limit, validateBody(forgotPasswordRequestSchema), async (request, response) => {
    const { email } = request.body as { email: string };
    await requestPasswordReset(links, email);
    response.status(202).json({ message: `A reset link was sent to ${email}; it works once, within the hour` });
  });

  router.get('/links/:token', limit, async (request, response) => {
    const token = String(request.params.token);
    if (token.length < 20 || token.length > 200) throw badRequest('This link is malformed', { token: 'malformed' });
    response.json(await describeLink(links, token));
  });

  router.post('/links/accept', limit, validateBody(setPasswordRequestSchema), async (request, response) => {
    const { token, password } = request.body as { token: string; password: string };
    const user = await acceptLink(links, token, password);
    user.lastSignInAt = context.now();
    await user.save();
    response.append('Set-Cookie', await context.sessions.create(user.id));
    response.json({ user: presentUser(user) });
  });

  return router;
}
