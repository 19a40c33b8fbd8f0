import { describe, expect, it } from 'vitest';
import { RESTORABLE_KINDS } from '@shared/domain/audit';
import { PERMISSIONS, RESTORE_PERMISSION, can, rolesWith, type Permission } from '@shared/domain/permissions';
import { ROLES } from '@shared/domain/roles';

describe('the permission policy', () => {
  it('lets each role change only its own kind of data', () => {
    const held = (role: (typeof ROLES)[number]) => (Object.keys(PERMISSIONS) as Permission[]).filter((p) => can(role, p)).sort();
    expect(held('planner')).toEqual(['deleted-items.list', 'routes.edit', 'scenarios.edit']);
    expect(held('analyst')).toEqual([
      'basemap.manage',
      'batch-runs.start',
      'calibration.edit',
      'deleted-items.list',
      'road-network.upload',
      'scenarios.edit',
      'service-days.edit',
      'terrain.manage',
      'vehicles.edit',
    ]);
    expect(held('safety')).toEqual(['reviews.act']);
    expect(held('board')).toEqual([]);
    expect(held('admin')).toEqual([
      'audit.read',
      'basemap.manage',
      'calibration.edit',
      'deleted-items.list',
      'mail.read',
      'network-settings.edit',
      'people.manage',
      'service-days.edit',
      'terrain.force-delete',
      'terrain.manage',
    ]);
  });

  it('grants nothing to someone not signed in', () => {
    expect(can(null, 'reviews.act')).toBe(false);
    expect(can(undefined, 'routes.edit')).toBe(false);
  });

  it('restores each deleted kind with the permission that changes it', () => {
    for (const kind of RESTORABLE_KINDS) expect(rolesWith(RESTORE_PERMISSION[kind]).length).toBeGreaterThan(0);
    expect(rolesWith(RESTORE_PERMISSION.route)).toEqual(['planner']);
    expect(rolesWith(RESTORE_PERMISSION.terrain)).toEqual(['analyst', 'admin']);
  });
});
