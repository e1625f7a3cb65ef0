import type { HealthResponse } from '../../shared/schemas/auth';
import type { Role } from '../../shared/schemas/users';

export type AreaId =
  | 'overview'
  | 'designs'
  | 'sessions'
  | 'compare'
  | 'instruments'
  | 'people'
  | 'mailbox'
  | 'settings';

export type Area = {
  id: AreaId;
  /** The link text; browser tests find navigation links by it. */
  label: string;
  path: string;
  /** One line for the overview's map of the app. */
  summary: string;
  group: 'work' | 'team' | 'account';
  /** Roles that may open the area; every role when absent. */
  roles?: readonly Role[];
  /** Shown only while the server sends mail to its local stand-in (development, tests). */
  needsMailStandIn?: boolean;
};

export const areas: readonly Area[] = [
  { id: 'overview', label: 'Overview', path: '/', summary: 'Where you are and what your role does.', group: 'work' },
  {
    id: 'designs',
    label: 'Designs',
    path: '/designs',
    summary: 'Front-end boards with their component values, tolerances and predicted rejection.',
    group: 'work',
  },
  {
    id: 'sessions',
    label: 'Bench sessions',
    path: '/sessions',
    summary: 'Measurements taken on real boards: sweeps, captures, instruments and notes.',
    group: 'work',
  },
  {
    id: 'compare',
    label: 'Compare',
    path: '/compare',
    summary: 'Predicted against measured common-mode rejection, frequency by frequency.',
    group: 'work',
  },
  {
    id: 'instruments',
    label: 'Instruments',
    path: '/instruments',
    summary: 'Generators, scopes and probes used on the bench, with their calibration state.',
    group: 'work',
  },
  {
    id: 'people',
    label: 'People',
    path: '/people',
    summary: 'Invite people, set their roles, deactivate accounts.',
    group: 'team',
    roles: ['lead'],
  },
  {
    id: 'mailbox',
    label: 'Mailbox',
    path: '/mailbox',
    summary: 'E-mail the server sent while using its local mail stand-in.',
    group: 'team',
    roles: ['lead'],
    needsMailStandIn: true,
  },
  { id: 'settings', label: 'Settings', path: '/settings', summary: 'Your account and access tokens for bench programs.', group: 'account' },
];

/** Whether a role may open an area at all (regardless of how mail is configured). */
export function roleMayOpen(area: Area, role: Role): boolean {
  return area.roles === undefined || area.roles.includes(role);
}

/**
 * The areas to list in the navigation for a role. The mailbox is listed only once the health check
 * has said mail goes to the local stand-in; while unknown (`undefined`) it stays hidden.
 */
export function visibleAreas(role: Role, mail: HealthResponse['mail'] | undefined): Area[] {
  return areas.filter(
    (area) => roleMayOpen(area, role) && (!area.needsMailStandIn || mail === 'local-stand-in'),
  );
}

export function areaById(id: AreaId): Area {
  const area = areas.find((candidate) => candidate.id === id);
  if (!area) throw new Error(`areaById: no area with id "${id}"`);
  return area;
}
