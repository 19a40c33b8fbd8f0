import type { User } from '@shared/domain/auth';
import type { RoadRoute, RoadRouteDraft } from '@shared/domain/road-routes';
import type { Database, Executor } from '../db/client';
import { isUniqueViolation } from '../db/errors';
import { BadRequestError, ConflictError, NotFoundError } from '../http/http-error';
import { recordAudit } from '../audit/audit-log';
import * as repository from './road-routes-repository';
import { clipSpeedLimits, lineLengthM, placeStops, StopOffLineError } from './route-geometry';

/** Shortest route the engine can analyse meaningfully, m (common practice: a few spacings). */
const MIN_ROUTE_LENGTH_M = 20;

/** Who saves: a signed-in person, or the demo seed (no account). */
export interface Author {
  id: string | null;
  name: string;
}

export function authorOf(user: User): Author {
  return { id: user.id, name: user.name };
}

/** Turns a draft into the stored content of a version: length, placed stops, clipped stretches. */
export function prepareVersion(draft: RoadRouteDraft, author: Author): repository.NewRouteVersion {
  const lengthM = lineLengthM(draft.geometry.coordinates);
  if (!(lengthM >= MIN_ROUTE_LENGTH_M)) {
    throw new BadRequestError(`geometry: the route is ${lengthM.toFixed(1)} m long; it needs at least ${MIN_ROUTE_LENGTH_M} m`, {
      field: 'geometry',
    });
  }
  let stops;
  try {
    stops = placeStops(draft.geometry.coordinates, draft.stops);
  } catch (error) {
    // A stop off the line is the planner's input to fix, not a server fault.
    if (error instanceof StopOffLineError) {
      throw new BadRequestError(error.message, { field: `stops.${error.index}`, stop: error.stopName, offsetM: error.offsetM });
    }
    throw error;
  }
  return {
    name: draft.name,
    description: draft.description,
    mode: draft.mode,
    coordinates: draft.geometry.coordinates,
    stops,
    speedLimits: clipSpeedLimits(draft.speedLimits, lengthM),
    defaultSpeedLimitKph: draft.defaultSpeedLimitKph,
    tripsPerDay: draft.tripsPerDay,
    serviceDaysPerYear: draft.serviceDaysPerYear,
    lengthM,
    createdById: author.id,
    createdByName: author.name,
  };
}

/** Creates a route with its version 1. */
export async function createRoute(db: Executor, author: Author, draft: RoadRouteDraft, seedKey?: string): Promise<RoadRoute> {
  const content = prepareVersion(draft, author);
  const run = async (tx: Executor) => {
    const route = await repository.insertRoute(tx, { createdById: author.id, seedKey });
    const version = await repository.insertVersion(tx, route.id, 1, content);
    await recordAudit(tx, author, {
      action: 'create',
      kind: 'route',
      entityId: route.id,
      entityName: content.name,
      details: { version: 1 },
    });
    return repository.toRoadRoute(version, route.updatedAt);
  };
  return (db as Database).transaction(run);
}

/** Creates several routes at once: all or none. `importSha256` marks a single route imported from a file. */
export async function createRoutes(
  db: Database,
  author: Author,
  drafts: RoadRouteDraft[],
  { importSha256 }: { importSha256?: string } = {},
): Promise<RoadRoute[]> {
  const contents = drafts.map((draft) => prepareVersion(draft, author));
  return db.transaction(async (tx) => {
    const saved: RoadRoute[] = [];
    for (const content of contents) {
      const route = await repository.insertRoute(tx, {
        createdById: author.id,
        importSha256: drafts.length === 1 ? importSha256 : undefined,
      });
      const version = await repository.insertVersion(tx, route.id, 1, content);
      await recordAudit(tx, author, {
        action: 'create',
        kind: 'route',
        entityId: route.id,
        entityName: content.name,
        details: { version: 1, imported: true },
      });
      saved.push(repository.toRoadRoute(version, route.updatedAt));
    }
    return saved;
  });
}

/** Saves a new version; earlier versions stay as they were (scenarios may point at them). */
export async function saveVersion(db: Database, author: Author, routeId: string, draft: RoadRouteDraft): Promise<RoadRoute> {
  const content = prepareVersion(draft, author);
  return db.transaction(async (tx) => {
    const route = await repository.lockRoute(tx, routeId);
    if (!route) throw new NotFoundError('The route');
    const next = route.currentVersion + 1;
    const version = await repository.insertVersion(tx, routeId, next, content);
    await repository.setCurrentVersion(tx, routeId, next);
    await recordAudit(tx, author, {
      action: 'update',
      kind: 'route',
      entityId: routeId,
      entityName: content.name,
      details: { version: next },
    });
    return repository.toRoadRoute(version);
  });
}

export async function getRoute(db: Executor, routeId: string, version?: number): Promise<RoadRoute> {
  const route = await repository.findRoute(db, routeId);
  if (!route) throw new NotFoundError('The route');
  const wanted = version ?? route.currentVersion;
  const row = await repository.findVersion(db, routeId, wanted);
  if (!row) throw new NotFoundError(`Version ${wanted} of the route`);
  return repository.toRoadRoute(row, version === undefined ? route.updatedAt : row.createdAt);
}

/** Deletes a route, restorably: it is hidden everywhere and removed for good after the retention period. */
export async function deleteRoute(db: Database, actor: Author, routeId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const route = await repository.lockRoute(tx, routeId);
    if (!route) throw new NotFoundError('The route');
    const used = await repository.countScenariosUsingRoute(tx, routeId);
    if (used > 0) {
      throw new ConflictError(
        `The route is used by ${used} scenario${used === 1 ? '' : 's'}; delete or move ${used === 1 ? 'it' : 'them'} first`,
        'route_in_use',
        { scenarioCount: used },
      );
    }
    const current = await repository.findVersion(tx, routeId, route.currentVersion);
    await repository.markRouteDeleted(tx, routeId, actor);
    await recordAudit(tx, actor, { action: 'delete', kind: 'route', entityId: routeId, entityName: current?.name ?? routeId });
  });
}

/** Brings a deleted route back as it was. */
export async function restoreRoute(db: Database, actor: Author, routeId: string): Promise<RoadRoute> {
  let importSha256 = null as string | null;
  try {
    await db.transaction(async (tx) => {
      const route = await repository.lockRoute(tx, routeId, true);
      if (!route?.deletedAt) throw new NotFoundError('A deleted route with that id');
      importSha256 = route.importSha256;
      const current = await repository.findVersion(tx, routeId, route.currentVersion);
      if (route.importSha256) {
        // Its file was imported again while it was deleted: two live routes from one file would be a silent duplicate.
        const copy = await repository.findRouteByImportSha256(tx, route.importSha256);
        if (copy) throw importedAgain(copy);
      }
      await repository.markRouteRestored(tx, routeId);
      await recordAudit(tx, actor, { action: 'restore', kind: 'route', entityId: routeId, entityName: current?.name ?? routeId });
    });
  } catch (error) {
    // The same file imported (or another copy restored) between the check above and the write:
    // the partial unique index on import_sha256 refused the second live copy. Once that copy is
    // committed it is visible, so the answer is the same 409 as without the race.
    if (importSha256 && isUniqueViolation(error)) {
      const copy = await repository.findRouteByImportSha256(db, importSha256);
      if (copy) throw importedAgain(copy);
    }
    throw error;
  }
  return getRoute(db, routeId);
}

function importedAgain(copy: { id: string; name: string }): ConflictError {
  return new ConflictError(
    `The route was imported again from the same file while it was deleted, as the route “${copy.name}”: open that route, or delete it first to restore this one`,
    'already_imported',
    { routeId: copy.id, routeName: copy.name },
  );
}
