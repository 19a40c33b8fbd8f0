import type { RestorableKind } from './audit';
import type { Role } from './roles';

/**
 * Who may change what: the one permission policy. The API's endpoint `access` rules and the
 * interface's buttons, pages and menus both read it, so a role never sees a button the server
 * refuses, nor misses one it allows. Reading is open to every signed-in role (the API's
 * 'signed-in' access); only the changes below are restricted. The authorization matrix test
 * (spec/api/authorization-matrix.spec.ts) states the designed access independently and checks
 * every endpoint against it as every role.
 */
export const PERMISSIONS = {
  /** Draw, import, change, delete and restore routes. */
  'routes.edit': ['planner'],
  /** Upload the reference road network used for snapping. */
  'road-network.upload': ['analyst'],
  /** Create, change, delete, restore and run scenarios. */
  'scenarios.edit': ['planner', 'analyst'],
  /** Create, change, delete and restore vehicle profiles. */
  'vehicles.edit': ['analyst'],
  /** Upload logged trips and decide on calibrations. */
  'calibration.edit': ['analyst', 'admin'],
  /** Upload, delete and restore terrain models. */
  'terrain.manage': ['analyst', 'admin'],
  /** Delete a terrain model saved scenarios still depend on (`?force=true`). */
  'terrain.force-delete': ['admin'],
  /** Upload and replace the base map. */
  'basemap.manage': ['analyst', 'admin'],
  /** Create, change, delete, restore and run service days (blocks, chargers), and build them from a GTFS feed. */
  'service-days.edit': ['analyst', 'admin'],
  /** Re-run every in-service scenario at once. */
  'batch-runs.start': ['analyst'],
  /** Acknowledge, mitigate, accept and reopen descent reviews. */
  'reviews.act': ['safety'],
  /** See what was deleted recently (each kind is restored by those who may change it). */
  'deleted-items.list': ['planner', 'analyst', 'admin'],
  /** Invite people, set roles, disable accounts. */
  'people.manage': ['admin'],
  /** Read the outgoing and captured mail. */
  'mail.read': ['admin'],
  /** Read the audit log. */
  'audit.read': ['admin'],
  /** Set the network's energy tariff and grid emission factor. */
  'network-settings.edit': ['admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

/** The roles that hold `permission`. */
export function rolesWith(permission: Permission): readonly Role[] {
  return PERMISSIONS[permission];
}

/** Whether `role` (null when nobody is signed in) holds `permission`. */
export function can(role: Role | null | undefined, permission: Permission): boolean {
  return role != null && (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

/** The permission that restores each kind of deleted thing: the one that changes it. */
export const RESTORE_PERMISSION: Readonly<Record<RestorableKind, Permission>> = {
  route: 'routes.edit',
  scenario: 'scenarios.edit',
  'vehicle-profile': 'vehicles.edit',
  terrain: 'terrain.manage',
  'service-day': 'service-days.edit',
};
