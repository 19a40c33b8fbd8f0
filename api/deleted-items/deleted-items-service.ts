/**
 * Restorable deletes. Routes, scenarios, service days, vehicle profiles and terrain models are never removed
 * when someone deletes them: they are hidden (deletedAt) and listed here, from where the roles
 * that may change them can restore them, for DELETED_RETENTION_DAYS. The maintenance sweep then
 * removes them for good (terrain with its files) and records that in the audit log.
 */
import type { RestorableKind } from '@shared/domain/audit';
import { DELETED_RETENTION_DAYS, type DeletedItem } from '@shared/domain/deleted-items';
import type { AppDeps } from '../app-deps';
import { SYSTEM_ACTOR, recordAudit } from '../audit/audit-log';
import type { Executor } from '../db/client';
import { deleteScenarioTerrainDependents, findDeletedRows, type DeletedEntityRow } from './deleted-items-repository';
import { purgeServiceDay } from '../service-days/service-days-repository';
import { purgeRoute } from '../road-routes/road-routes-repository';
import { purgeScenario } from '../scenarios/scenarios-repository';
import { purgeTerrain } from '../terrain/terrain-service';
import { purgeProfile } from '../vehicle-profiles/vehicle-profiles-repository';

const DAY_MS = 86_400_000;

interface DeletedRow {
  kind: RestorableKind;
  id: string;
  name: string;
  deletedAt: Date;
  deletedBy: string | null;
  blockedBy: string | null;
}

/** Everything deleted and not yet removed for good, newest first. */
export async function listDeletedItems(db: Executor): Promise<DeletedItem[]> {
  const rows = (await deletedRows(db)).sort((a, b) => b.deletedAt.getTime() - a.deletedAt.getTime());
  return rows.map((row) => ({
    kind: row.kind,
    id: row.id,
    name: row.name,
    deletedAt: row.deletedAt.toISOString(),
    deletedBy: row.deletedBy,
    removedAfter: new Date(row.deletedAt.getTime() + DELETED_RETENTION_DAYS * DAY_MS).toISOString(),
    blockedBy: row.blockedBy,
  }));
}

async function deletedRows(db: Executor, deletedBefore?: Date): Promise<DeletedRow[]> {
  const { routes, scenarios: scenarioRows, profiles, terrain, serviceDays: days } = await findDeletedRows(db, deletedBefore);
  const plain =
    (kind: RestorableKind) =>
    (row: DeletedEntityRow): DeletedRow => ({
      kind,
      id: row.id,
      name: row.name,
      deletedAt: row.deletedAt!,
      deletedBy: row.deletedBy,
      blockedBy: null,
    });
  return [
    ...routes.map(plain('route')),
    ...scenarioRows.map((row) => ({
      ...plain('scenario')(row),
      blockedBy: row.routeDeleted
        ? 'its route is deleted too: restore the route first'
        : row.profileDeleted
          ? 'its vehicle profile is deleted too: restore the profile first'
          : null,
    })),
    ...profiles.map(plain('vehicle-profile')),
    ...terrain.map(plain('terrain')),
    ...days.map(plain('service-day')),
  ];
}

/**
 * Removes for good what was deleted more than DELETED_RETENTION_DAYS ago (scenarios first: they
 * hold on to their routes and profiles), recording each removal. Returns how many went.
 */
export async function purgeExpiredDeletes(deps: AppDeps, now = new Date()): Promise<number> {
  const expired = await deletedRows(deps.db, new Date(now.getTime() - DELETED_RETENTION_DAYS * DAY_MS));
  const order: RestorableKind[] = ['service-day', 'scenario', 'route', 'vehicle-profile', 'terrain'];
  expired.sort((a, b) => order.indexOf(a.kind) - order.indexOf(b.kind));
  let purged = 0;
  for (const item of expired) {
    const details = { deletedAt: item.deletedAt.toISOString(), deletedBy: item.deletedBy };
    if (item.kind === 'terrain') {
      await purgeTerrain(deps, item.id);
      await recordAudit(deps.db, SYSTEM_ACTOR, { action: 'purge', kind: 'terrain', entityId: item.id, entityName: item.name, details });
      purged++;
      continue;
    }
    await deps.db.transaction(async (tx) => {
      if (item.kind === 'scenario') {
        await deleteScenarioTerrainDependents(tx, item.id);
        await purgeScenario(tx, item.id);
      } else if (item.kind === 'service-day') {
        await purgeServiceDay(tx, item.id);
      } else if (item.kind === 'route') {
        await purgeRoute(tx, item.id);
      } else {
        await purgeProfile(tx, item.id);
      }
      await recordAudit(tx, SYSTEM_ACTOR, { action: 'purge', kind: item.kind, entityId: item.id, entityName: item.name, details });
    });
    purged++;
  }
  return purged;
}
