import type { User as UserView } from '../../shared/schemas/users';
import type { User } from '../models';

export function presentUser(user: User): UserView {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    status: user.status,
    createdAt: user.createdAt.toISOString(),
    lastSignInAt: user.lastSignInAt ? user.lastSignInAt.toISOString() : null,
  };
}
