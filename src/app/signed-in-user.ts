import { createContext, useContext } from 'react';
import type { User } from '../../shared/schemas/users';

export const SignedInUserContext = createContext<User | null>(null);

/** The person signed in; only usable below RequireSession, which guarantees there is one. */
export function useSignedInUser(): User {
  const user = useContext(SignedInUserContext);
  if (!user) throw new Error('useSignedInUser: used outside a signed-in route');
  return user;
}
