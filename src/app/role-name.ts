import type { Role } from '../../shared/schemas/users';

/**
 * The display name of a role. Kept here rather than importing `roleLabels` from the shared schemas
 * so the always-loaded shell does not pull the validation library into the first download.
 */
const names: Record<Role, string> = { technician: 'Technician', designer: 'Designer', lead: 'Lead' };

export function roleName(role: Role): string {
  return names[role];
}
