import { Router } from 'express';
import { z } from 'zod';
import { inviteRequestSchema, updateUserRequestSchema, type InviteRequest, type UpdateUserRequest } from '../../../shared/schemas/users';
import type { AppContext } from '../../app-context';
import { authenticate, authorize } from '../../auth/middleware';
import { conflict, notFound } from '../../http/errors';
import { validateBody } from '../../http/validate';
import { User } from '../../models';
import { inviteUser, resendInvitation, type LinkContext } from '../../operations/account-links';
import { presentUser } from '../../presenters/user';

const idSchema = z.uuid({ error: 'Not a person id' });

export function usersRouter(context: AppContext): Router {
  const router = Router();
  const links: LinkContext = { sequelize: context.database.sequelize, mailer: context.mailer, config: context.config, now: context.now };
  router.use(authenticate(context.sessions), authorize('lead'));

  router.get('/', async (_request, response) => {
    const users = await User.findAll({ order: [['name', 'ASC'], ['email', 'ASC']] });
    response.json({ users: users.map(presentUser) });
  });

  router.post('/invitations', validateBody(inviteRequestSchema), async (request, response) => {
    const user = await inviteUser(links, request.body as InviteRequest, response.locals.user);
    response.status(201).json({ user: presentUser(user) });
  });

  router.post('/:id/invitations/resend', async (request, response) => {
    const id = idSchema.safeParse(request.params.id);
    if (!id.success) throw notFound('No such person');
    const user = await resendInvitation(links, id.data, response.locals.user);
    response.status(202).json({ message: `A new invitation was sent to ${user.email}` });
  });

  router.patch('/:id', validateBody(updateUserRequestSchema), async (request, response) => {
    const id = idSchema.safeParse(request.params.id);
    if (!id.success) throw notFound('No such person');
    const change = request.body as UpdateUserRequest;
    const user = await context.database.sequelize.transaction(async (transaction) => {
      const target = await User.findByPk(id.data, { transaction, lock: transaction.LOCK.UPDATE });
      if (!target) throw notFound('No such person');
      const isSelf = target.id === response.locals.user.id;
      if (isSelf && change.active === false) throw conflict('You cannot deactivate your own account', { active: 'not for yourself' });
      if (isSelf && change.role !== undefined && change.role !== 'lead') {
        throw conflict('You cannot take the lead role from yourself; ask another lead', { role: 'not for yourself' });
      }
      if (change.role !== undefined) target.role = change.role;
      if (change.active === false) target.status = 'deactivated';
      if (change.active === true && target.status === 'deactivated') target.status = target.passwordHash ? 'active' : 'invited';
      await target.save({ transaction });
      if (change.active === false) {
        // A deactivated person's sessions end at once; a role change needs nothing, since
        // every request reads the role afresh.
        await context.database.sequelize.query('DELETE FROM user_sessions WHERE user_id = $1', { bind: [target.id], transaction });
      }
      return target;
    });
    response.json({ user: presentUser(user) });
  });

  return router;
}
