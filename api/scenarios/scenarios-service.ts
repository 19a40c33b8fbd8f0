import type { User } from '@shared/domain/auth';
import type { RiskLevel } from '@shared/domain/analysis';
import type { Scenario, ScenarioDraft, ScenarioListQuery, ScenarioResult } from '@shared/domain/scenarios';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import type { AppDeps } from '../app-deps';
import { analyserOf } from '../app-services';
import type { Database } from '../db/client';
import { type Actor, recordAudit } from '../audit/audit-log';
import { BadRequestError, ConflictError, HttpError, NotFoundError } from '../http/http-error';
import { STORED_RESULT_VERSION } from '../results/stored-result';
import { syncReviewItems } from '../reviews/review-sync';
import { replaceScenarioTerrainUse } from '../terrain/terrain-repository';
import * as routes from '../road-routes/road-routes-repository';
import * as profiles from '../vehicle-profiles/vehicle-profiles-repository';
import * as repository from './scenarios-repository';
import { readSafetySettings } from '../board/network-settings';
import { resolveLoadAndSeason, runScenario } from './scenario-run';

/** Route version and vehicle profile a draft refers to; 400 naming the field when either is missing. */
async function resolveReferences(db: Database, draft: ScenarioDraft) {
  const route = await routes.findRoute(db, draft.routeId);
  if (!route) throw new BadRequestError(`routeId: no route ${draft.routeId}`, { field: 'routeId' });
  const version = draft.routeVersion ?? route.currentVersion;
  const routeVersion = await routes.findVersion(db, draft.routeId, version);
  if (!routeVersion) {
    throw new BadRequestError(`routeVersion: the route has no version ${version} (latest is ${route.currentVersion})`, {
      field: 'routeVersion',
    });
  }
  const profileRow = await profiles.findProfile(db, draft.vehicleProfileId);
  if (!profileRow)
    throw new BadRequestError(`vehicleProfileId: no vehicle profile ${draft.vehicleProfileId}`, { field: 'vehicleProfileId' });
  assertWithinPermissibleMass(profiles.toVehicleProfile(profileRow), draft);
  return { routeVersion, profileRow, pinned: draft.routeVersion !== undefined };
}

/** 400 naming the load when the scenario's load takes the vehicle above its permissible gross mass. */
function assertWithinPermissibleMass(profile: VehicleProfile, draft: ScenarioDraft): void {
  const limitKg = profile.vehicle.permissibleGrossMassKg;
  if (limitKg === undefined) return;
  const { payloadKg } = resolveLoadAndSeason(profile, draft);
  const massKg = profile.vehicle.curbMassKg + payloadKg;
  if (massKg <= limitKg + 1e-6) return;
  const field = draft.load.kind === 'passengers' ? 'load.passengers' : 'load.case';
  throw new BadRequestError(
    `${field}: this load takes ${profile.name} to ${Math.round(massKg)} kg, above its permissible gross mass of ` +
      `${Math.round(limitKg)} kg; carry fewer passengers or choose a lighter load case`,
    { field, massKg, permissibleGrossMassKg: limitKg },
  );
}

/** Computes and stores the result of a saved scenario (synchronous: a 50 km route takes milliseconds). */
async function computeAndStore(deps: AppDeps, scenarioId: string): Promise<void> {
  const { db } = deps;
  const row = await repository.findScenarioRow(db, scenarioId);
  if (!row) throw new NotFoundError('The scenario');
  const routeVersion = await routes.findVersion(db, row.routeId, row.routeVersion);
  const profileRow = await profiles.findProfile(db, row.vehicleProfileId);
  if (!routeVersion || !profileRow) throw new NotFoundError('The scenario’s route version or vehicle profile');
  const profile = profiles.toVehicleProfile(profileRow);
  await repository.updateScenario(db, scenarioId, { status: 'running', failureReason: null });
  const safety = await readSafetySettings(db);
  const provenance = {
    routeVersion: routeVersion.version,
    routeVersionId: routeVersion.id,
    vehicleProfileUpdatedAt: profileRow.updatedAt.toISOString(),
    engineVersion: '',
    // Recorded so a later change of these settings marks the result out of date.
    safetySettings: { ...safety },
  };
  let outcome;
  try {
    outcome = await runScenario(routeVersion, profile, row, analyserOf(deps), safety);
  } catch (error) {
    // Busy analysis threads: the run did not happen; say so and keep the last good result.
    if (error instanceof HttpError && error.status === 503) {
      await repository.updateScenario(db, scenarioId, { status: 'failed', failureReason: error.message });
      return;
    }
    // Anything else is a fault on our side: record it so the scenario does not stay "running".
    console.error(`[scenarios] run of ${scenarioId} failed:`, error);
    await repository.updateScenario(db, scenarioId, {
      status: 'failed',
      failureReason: 'the calculation stopped with an unexpected error; the administrators can find it in the server log',
    });
    return;
  }
  provenance.engineVersion = outcome.engineVersion;
  if (!outcome.ok) {
    // A failed run keeps the last good result (with the inputs and engine version it was computed
    // with): the board and the descent review go on reading it, and the reason is shown beside it.
    await repository.updateScenario(db, scenarioId, { status: 'failed', failureReason: outcome.failureReason });
    return;
  }
  const riskCounts: Record<RiskLevel, number> = { low: 0, elevated: 0, high: 0, critical: 0 };
  for (const direction of outcome.directions) for (const descent of direction.descents) riskCounts[descent.risk]++;
  const computedAt = new Date();
  await db.transaction(async (tx) => {
    await repository.updateScenario(tx, scenarioId, {
      status: 'done',
      failureReason: null,
      engineVersion: outcome.engineVersion,
      computedAt,
      inputs: { provenance, ...outcome.inputs },
      summary: outcome.summary,
      riskCounts,
      directionResults: outcome.directions,
      resultVersion: STORED_RESULT_VERSION,
    });
    // Descent review follows every stored result, in the same transaction (api/reviews/review-sync.ts).
    await syncReviewItems(tx, row, { computedAt, directions: outcome.directions });
    // A terrain model a result was computed on cannot be deleted while the scenario exists.
    const sampledTerrain = routeVersion.coordinates.some((position) => position.length < 3);
    await replaceScenarioTerrainUse(tx, scenarioId, sampledTerrain ? routeVersion.id : null);
  });
}

/** The scenarios the query asks for, each marked out of date against the current route, profile, engine and safety settings. */
export async function listScenarios(db: Database, query: ScenarioListQuery): Promise<Scenario[]> {
  const [rows, safety] = await Promise.all([repository.listScenarios(db, query), readSafetySettings(db)]);
  return rows.map((row) => repository.toScenario(row, safety));
}

export async function getScenario(db: Database, id: string): Promise<Scenario> {
  const row = await repository.findScenarioWithContext(db, id);
  if (!row) throw new NotFoundError('The scenario');
  return repository.toScenario(row, await readSafetySettings(db));
}

export async function createScenario(
  deps: AppDeps,
  author: { id: string | null; name: string },
  draft: ScenarioDraft,
  seedKey?: string,
): Promise<Scenario> {
  const row = await deps.db.transaction(async (tx) => {
    const inserted = await repository.insertScenario(tx, {
      ...(await draftColumns(deps.db, draft)),
      status: 'queued',
      createdById: author.id,
      createdByName: author.name,
      seedKey: seedKey ?? null,
    });
    await recordAudit(tx, author, { action: 'create', kind: 'scenario', entityId: inserted.id, entityName: inserted.name });
    return inserted;
  });
  await computeAndStore(deps, row.id);
  return getScenario(deps.db, row.id);
}

/** The stored columns for a scenario draft, with the route version it resolves to. */
async function draftColumns(db: Database, draft: ScenarioDraft) {
  const { routeVersion, pinned } = await resolveReferences(db, draft);
  return {
    name: draft.name,
    routeId: draft.routeId,
    routeVersion: routeVersion.version,
    routeVersionPinned: pinned,
    direction: draft.direction,
    vehicleProfileId: draft.vehicleProfileId,
    load: draft.load,
    season: draft.season,
    startSoc: draft.startSoc,
    options: draft.options,
    inService: draft.inService,
  };
}

/** Saves changed settings and recomputes. */
export async function updateScenario(deps: AppDeps, actor: Actor, id: string, draft: ScenarioDraft): Promise<Scenario> {
  const existing = await repository.findScenarioWithContext(deps.db, id);
  if (!existing) throw new NotFoundError('The scenario');
  const columns = await draftColumns(deps.db, draft);
  await deps.db.transaction(async (tx) => {
    await repository.updateScenario(tx, id, columns);
    await recordAudit(tx, actor, { action: 'update', kind: 'scenario', entityId: id, entityName: columns.name });
  });
  await computeAndStore(deps, id);
  return getScenario(deps.db, id);
}

/**
 * Re-runs on demand: an unpinned scenario moves to the route's latest version first; the
 * profile and engine are always the current ones. This clears staleness.
 */
export async function rerunScenario(deps: AppDeps, id: string): Promise<Scenario> {
  const existing = await repository.findScenarioWithContext(deps.db, id);
  if (!existing) throw new NotFoundError('The scenario');
  if (!existing.scenario.routeVersionPinned && existing.scenario.routeVersion !== existing.latestRouteVersion) {
    await repository.updateScenario(deps.db, id, { routeVersion: existing.latestRouteVersion });
  }
  await computeAndStore(deps, id);
  return getScenario(deps.db, id);
}

/**
 * Deletes a scenario, restorably: hidden everywhere (lists, the board, network runs) and removed
 * for good after the retention period. What it recorded about terrain use stays with it, but a
 * deleted scenario no longer holds terrain back from deletion.
 */
export async function deleteScenario(db: Database, actor: Actor, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const existing = await repository.lockScenario(tx, id);
    if (!existing) throw new NotFoundError('The scenario');
    await repository.markScenarioDeleted(tx, id, actor);
    await recordAudit(tx, actor, { action: 'delete', kind: 'scenario', entityId: id, entityName: existing.name });
  });
}

/** Brings a deleted scenario back with its settings and last result; its route and vehicle profile must exist. */
export async function restoreScenario(db: Database, actor: Actor, id: string): Promise<Scenario> {
  await db.transaction(async (tx) => {
    const existing = await repository.lockScenario(tx, id, true);
    if (!existing?.deletedAt) throw new NotFoundError('A deleted scenario with that id');
    if (!(await routes.findRoute(tx, existing.routeId))) {
      throw new ConflictError('Its route is deleted too; restore the route first', 'route_deleted', { routeId: existing.routeId });
    }
    if (!(await profiles.findProfile(tx, existing.vehicleProfileId))) {
      throw new ConflictError('Its vehicle profile is deleted too; restore the profile first', 'vehicle_profile_deleted', {
        vehicleProfileId: existing.vehicleProfileId,
      });
    }
    await repository.markScenarioRestored(tx, id);
    await recordAudit(tx, actor, { action: 'restore', kind: 'scenario', entityId: id, entityName: existing.name });
  });
  return getScenario(db, id);
}

export async function getResult(db: Database, id: string): Promise<ScenarioResult> {
  const row = await repository.findScenarioRow(db, id);
  if (!row) throw new NotFoundError('The scenario');
  const stored = repository.readScenarioResult(row);
  if (!stored || !row.computedAt || !row.engineVersion) {
    throw new HttpError(
      404,
      'no_result',
      row.failureReason ? `The scenario has no result: ${row.failureReason}` : 'The scenario has no result yet; run it first',
      { status: row.status, failureReason: row.failureReason },
    );
  }
  return {
    scenarioId: row.id,
    engineVersion: row.engineVersion,
    computedAt: row.computedAt.toISOString(),
    inputs: row.inputs,
    summary: stored.summary,
    directions: stored.directions,
    caution: ENGINEERING_CAUTION,
  };
}

export async function compareScenarios(db: Database, ids: string[]) {
  const unique = [...new Set(ids)];
  if (unique.length !== ids.length) throw new BadRequestError('ids: each scenario may appear once', { field: 'ids' });
  const rows = await repository.findScenariosWithContext(db, unique);
  const missing = unique.filter((id) => !rows.some((row) => row.scenario.id === id));
  if (missing.length > 0) throw new HttpError(404, 'not_found', `No scenario ${missing.join(', ')}`, { missing });
  const safety = await readSafetySettings(db);
  const items = [];
  for (const id of unique) {
    const row = rows.find((candidate) => candidate.scenario.id === id)!;
    let result: ScenarioResult | null = null;
    if (row.scenario.summary) result = await getResult(db, id);
    items.push({ scenario: repository.toScenario(row, safety), result });
  }
  return { items, caution: ENGINEERING_CAUTION };
}

export function authorOf(user: User) {
  return { id: user.id, name: user.name };
}
