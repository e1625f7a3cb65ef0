import type { Role } from '../../../../shared/schemas/users';

/** Who may start sessions and add sweeps (the API's `authorize('technician')`: every role from technician up). */
export function canRecordSessions(role: Role): boolean {
  return role === 'technician' || role === 'designer' || role === 'lead';
}
