import { and, asc, eq, getTableColumns, inArray, isNull, lt, sql, type SQL } from 'drizzle-orm';
import type { Scenario, ScenarioListQuery } from '@shared/domain/scenarios';
import { ENGINE_VERSION } from '@shared/engine/constants';
import type { SelectedFieldsFlat } from 'drizzle-orm/pg-core';
import { safetySettingsChangedReason, type NetworkSafetySettings } from '../board/network-settings';
import type { Executor } from '../db/client';
import { roadRoutes, roadRouteVersions, scenarios, vehicleProfiles, type ScenarioRow } from '../db/schema/index';
import { readStoredScenarioResult, type StoredScenarioResult } from '../results/stored-result';

/** Scenario columns without the (large) per-point results. */
const { directionResults: _directionResults, ...scenarioColumns } = getTableColumns(scenarios);

export type ScenarioHead = Omit<ScenarioRow, 'directionResults'>;

export interface ScenarioWithContext {
  scenario: ScenarioHead;
  routeName: string;
  latestRouteVersion: number;
  vehicleProfileName: string;
  vehicleProfileUpdatedAt: Date;
}

/** Scenarios with their route's and profile's names; `scenario` picks the scenario's own columns. */
function selectWithContext<Columns extends SelectedFieldsFlat>(db: Executor, scenario: Columns) {
  return db
    .select({
      scenario,
      routeName: roadRouteVersions.name,
      latestRouteVersion: roadRoutes.currentVersion,
      vehicleProfileName: vehicleProfiles.name,
      vehicleProfileUpdatedAt: vehicleProfiles.updatedAt,
    })
    .from(scenarios)
    .innerJoin(roadRoutes, eq(roadRoutes.id, scenarios.routeId))
    .innerJoin(
      roadRouteVersions,
      and(eq(roadRouteVersions.routeId, scenarios.routeId), eq(roadRouteVersions.version, scenarios.routeVersion)),
    )
    .innerJoin(vehicleProfiles, eq(vehicleProfiles.id, scenarios.vehicleProfileId));
}

/**
 * The list needs of a run's stored inputs only their provenance (for the stale check); the engine
 * inputs of every direction beside it would be read, sent and parsed for every row and dropped.
 */
const { inputs: _inputs, ...scenarioListColumns } = scenarioColumns;
const provenanceOnly = sql<
  ScenarioHead['inputs']
>`case when ${scenarios.inputs} is null then null else jsonb_build_object('provenance', ${scenarios.inputs} -> 'provenance') end`;

export async function listScenarios(db: Executor, query: ScenarioListQuery): Promise<ScenarioWithContext[]> {
  const conditions: SQL[] = [isNull(scenarios.deletedAt)];
  if (query.routeId) conditions.push(eq(scenarios.routeId, query.routeId));
  if (query.vehicleProfileId) conditions.push(eq(scenarios.vehicleProfileId, query.vehicleProfileId));
  if (query.inService !== undefined) conditions.push(eq(scenarios.inService, query.inService));
  return (await selectWithContext(db, { ...scenarioListColumns, inputs: provenanceOnly })
    .where(and(...conditions))
    .orderBy(asc(scenarios.name), asc(scenarios.id))) as ScenarioWithContext[];
}

export async function findScenarioWithContext(db: Executor, id: string): Promise<ScenarioWithContext | undefined> {
  const [row] = await selectWithContext(db, scenarioColumns).where(and(eq(scenarios.id, id), isNull(scenarios.deletedAt)));
  return row as ScenarioWithContext | undefined;
}

export async function findScenariosWithContext(db: Executor, ids: string[]): Promise<ScenarioWithContext[]> {
  return (await selectWithContext(db, scenarioColumns).where(
    and(inArray(scenarios.id, ids), isNull(scenarios.deletedAt)),
  )) as ScenarioWithContext[];
}

/** Id and name of every scenario (not deleted) on a vehicle profile, by name (for re-running them all). */
export function listScenarioNamesOfProfile(db: Executor, vehicleProfileId: string): Promise<{ id: string; name: string }[]> {
  return db
    .select({ id: scenarios.id, name: scenarios.name })
    .from(scenarios)
    .where(and(eq(scenarios.vehicleProfileId, vehicleProfileId), isNull(scenarios.deletedAt)))
    .orderBy(scenarios.name);
}

/** Id and name of every scenario in service (not deleted), by name: a network run's items. */
export function listInServiceScenarioNames(db: Executor): Promise<{ id: string; name: string }[]> {
  return db
    .select({ id: scenarios.id, name: scenarios.name })
    .from(scenarios)
    .where(and(eq(scenarios.inService, true), isNull(scenarios.deletedAt)))
    .orderBy(asc(scenarios.name));
}

export async function findScenarioRow(db: Executor, id: string, includeDeleted = false): Promise<ScenarioRow | undefined> {
  const [row] = await db
    .select()
    .from(scenarios)
    .where(and(eq(scenarios.id, id), includeDeleted ? undefined : isNull(scenarios.deletedAt)));
  return row;
}

export async function lockScenario(db: Executor, id: string, includeDeleted = false): Promise<ScenarioHead | undefined> {
  const [row] = await db
    .select(scenarioColumns)
    .from(scenarios)
    .where(and(eq(scenarios.id, id), includeDeleted ? undefined : isNull(scenarios.deletedAt)))
    .for('update');
  return row as ScenarioHead | undefined;
}

export async function insertScenario(db: Executor, values: typeof scenarios.$inferInsert): Promise<ScenarioHead> {
  const [row] = await db.insert(scenarios).values(values).returning(scenarioColumns);
  return row as ScenarioHead;
}

/**
 * What a scenario's stored result answer depends on, read without the result itself: the row's
 * version (PostgreSQL's `xmin`, new with every change of the row, whoever makes it: a run, an
 * edit, a restore, a query by hand), its last change and its run (`updatedAt`, `computedAt`), the
 * engine and the stored result's schema version. Undefined for a scenario that does not exist,
 * is deleted or has no result.
 */
export async function findResultIdentity(db: Executor, id: string) {
  const [row] = await db
    .select({
      rowVersion: sql<string>`xmin::text`,
      updatedAt: scenarios.updatedAt,
      computedAt: scenarios.computedAt,
      engineVersion: scenarios.engineVersion,
      resultVersion: scenarios.resultVersion,
    })
    .from(scenarios)
    .where(and(eq(scenarios.id, id), isNull(scenarios.deletedAt)));
  if (!row?.computedAt || !row.engineVersion) return undefined;
  return [id, row.rowVersion, row.updatedAt.toISOString(), row.computedAt.toISOString(), row.engineVersion, row.resultVersion] as const;
}

/**
 * The scenario's stored result, upgraded from its schema version to the current shape and parsed
 * (api/results/stored-result.ts); null when the scenario has none. Every read of a stored result
 * goes through here.
 */
export function readScenarioResult(
  row: Pick<ScenarioRow, 'id' | 'resultVersion' | 'summary' | 'riskCounts' | 'directionResults'>,
): StoredScenarioResult | null {
  if (!row.summary || !row.directionResults) return null;
  return readStoredScenarioResult(`Scenario ${row.id}`, {
    version: row.resultVersion,
    summary: row.summary,
    riskCounts: row.riskCounts,
    directionResults: row.directionResults,
  });
}

export async function updateScenario(db: Executor, id: string, values: Partial<typeof scenarios.$inferInsert>) {
  await db
    .update(scenarios)
    .set({ ...values, updatedAt: new Date() })
    .where(eq(scenarios.id, id));
}

/**
 * Scenarios left "running" since before `staleBefore`: their run stopped with its process (a run
 * takes seconds). They are marked failed with a reason and keep their last good result.
 */
export async function failInterruptedRuns(db: Executor, staleBefore: Date): Promise<number> {
  const failed = await db
    .update(scenarios)
    .set({
      status: 'failed',
      failureReason: 'the run stopped before it finished (the server was restarted); run it again',
      updatedAt: new Date(),
    })
    .where(and(eq(scenarios.status, 'running'), lt(scenarios.updatedAt, staleBefore), isNull(scenarios.deletedAt)))
    .returning({ id: scenarios.id });
  return failed.length;
}

/** Hides the scenario (restorable until the purge). */
export async function markScenarioDeleted(db: Executor, id: string, by: { id: string | null; name: string }) {
  await db.update(scenarios).set({ deletedAt: new Date(), deletedById: by.id, deletedByName: by.name }).where(eq(scenarios.id, id));
}

export async function markScenarioRestored(db: Executor, id: string) {
  await db.update(scenarios).set({ deletedAt: null, deletedById: null, deletedByName: null }).where(eq(scenarios.id, id));
}

/** Removes the scenario for good (the purge). */
export async function purgeScenario(db: Executor, id: string) {
  await db.delete(scenarios).where(eq(scenarios.id, id));
}

/**
 * What changed since the stored result was computed, in plain words: the engine, the route (when
 * not pinned), the vehicle profile, or one of the network's safety settings (`safety`, now).
 */
export function staleReasons(row: ScenarioWithContext, safety: NetworkSafetySettings): string[] {
  const provenance = row.scenario.inputs?.provenance;
  if (!provenance) return [];
  const reasons: string[] = [];
  if (provenance.engineVersion !== ENGINE_VERSION) {
    reasons.push(`the calculation engine changed (${provenance.engineVersion} → ${ENGINE_VERSION})`);
  }
  if (!row.scenario.routeVersionPinned && row.latestRouteVersion !== provenance.routeVersion) {
    reasons.push(`the route has a newer version (${row.latestRouteVersion}; the result is for version ${provenance.routeVersion})`);
  }
  if (provenance.vehicleProfileUpdatedAt !== row.vehicleProfileUpdatedAt.toISOString()) {
    reasons.push('the vehicle profile changed after the run');
  }
  const safetyReason = safetySettingsChangedReason(provenance.safetySettings, safety);
  if (safetyReason) reasons.push(safetyReason);
  return reasons;
}

/** The scenario as the API answers it; `safety` is the network's safety settings now (for staleness). */
export function toScenario(row: ScenarioWithContext, safety: NetworkSafetySettings): Scenario {
  const s = row.scenario;
  const reasons = staleReasons(row, safety);
  return {
    id: s.id,
    name: s.name,
    routeId: s.routeId,
    routeVersion: s.routeVersion,
    routeVersionPinned: s.routeVersionPinned,
    latestRouteVersion: row.latestRouteVersion,
    routeName: row.routeName,
    direction: s.direction,
    vehicleProfileId: s.vehicleProfileId,
    vehicleProfileName: row.vehicleProfileName,
    load: s.load,
    season: s.season,
    startSoc: s.startSoc,
    options: s.options,
    inService: s.inService,
    status: s.status,
    failureReason: s.failureReason,
    isStale: reasons.length > 0,
    staleReasons: reasons,
    engineVersion: s.engineVersion,
    computedAt: s.computedAt?.toISOString() ?? null,
    summary: s.summary,
    riskCounts: s.riskCounts,
    createdBy: s.createdByName,
    updatedAt: s.updatedAt.toISOString(),
  };
}
