import { and, asc, eq, inArray, isNull, lt, sql } from 'drizzle-orm';
import { readSafetySettings, safetySettingsChangedReason, type NetworkSafetySettings } from '../board/network-settings';
import { blockSchema, chargerSchema, type ServiceDay } from '@shared/domain/service-days';
import { ENGINE_VERSION } from '@shared/engine/constants';
import * as z from 'zod';
import type { Executor } from '../db/client';
import {
  roadRoutes,
  serviceDayResults,
  serviceDays,
  vehicleProfiles,
  type ServiceDayResultRow,
  type ServiceDayRow,
} from '../db/schema/index';

const storedBlocks = z.array(blockSchema);
const storedChargers = z.array(chargerSchema);

/** The stored blocks and chargers, parsed with the shared contract (a row written by hand or an older build fails loudly here). */
export function parseDocument(row: Pick<ServiceDayRow, 'blocks' | 'chargers'>) {
  return { blocks: storedBlocks.parse(row.blocks), chargers: storedChargers.parse(row.chargers) };
}

export async function findServiceDayRow(db: Executor, id: string, includeDeleted = false): Promise<ServiceDayRow | undefined> {
  const [row] = await db
    .select()
    .from(serviceDays)
    .where(and(eq(serviceDays.id, id), includeDeleted ? undefined : isNull(serviceDays.deletedAt)));
  return row;
}

export async function lockServiceDay(db: Executor, id: string, includeDeleted = false): Promise<ServiceDayRow | undefined> {
  const [row] = await db
    .select()
    .from(serviceDays)
    .where(and(eq(serviceDays.id, id), includeDeleted ? undefined : isNull(serviceDays.deletedAt)))
    .for('update');
  return row;
}

export async function listServiceDayRows(db: Executor, filter: { inService?: boolean } = {}): Promise<ServiceDayRow[]> {
  return db
    .select()
    .from(serviceDays)
    .where(and(isNull(serviceDays.deletedAt), filter.inService === undefined ? undefined : eq(serviceDays.inService, filter.inService)))
    .orderBy(asc(serviceDays.name), asc(serviceDays.id));
}

export async function insertServiceDay(db: Executor, values: typeof serviceDays.$inferInsert): Promise<ServiceDayRow> {
  const [row] = await db.insert(serviceDays).values(values).returning();
  return row!;
}

/** Saves a change and counts a new revision (which makes a result computed before it stale). */
export async function updateServiceDay(db: Executor, id: string, values: Partial<typeof serviceDays.$inferInsert>) {
  await db
    .update(serviceDays)
    .set({ ...values, revision: sql`${serviceDays.revision} + 1`, updatedAt: new Date() })
    .where(eq(serviceDays.id, id));
}

export async function markServiceDayDeleted(db: Executor, id: string, by: { id: string | null; name: string }) {
  await db.update(serviceDays).set({ deletedAt: new Date(), deletedById: by.id, deletedByName: by.name }).where(eq(serviceDays.id, id));
}

export async function markServiceDayRestored(db: Executor, id: string) {
  await db.update(serviceDays).set({ deletedAt: null, deletedById: null, deletedByName: null }).where(eq(serviceDays.id, id));
}

/** Removes the service day and its result for good (the purge). */
export async function purgeServiceDay(db: Executor, id: string) {
  await db.delete(serviceDays).where(eq(serviceDays.id, id));
}

export async function findResultRow(db: Executor, serviceDayId: string): Promise<ServiceDayResultRow | undefined> {
  const [row] = await db.select().from(serviceDayResults).where(eq(serviceDayResults.serviceDayId, serviceDayId));
  return row;
}

export async function findResultRows(db: Executor, serviceDayIds: string[]): Promise<ServiceDayResultRow[]> {
  if (serviceDayIds.length === 0) return [];
  return db.select().from(serviceDayResults).where(inArray(serviceDayResults.serviceDayId, serviceDayIds));
}

/** What the staleness check compares a stored result with: the routes' and profiles' current state. */
export interface StalenessContext {
  routeVersions: Map<string, number>;
  profileUpdatedAt: Map<string, string>;
  /** The network's safety settings now (network settings), to compare with those a run used. */
  safetySettings: NetworkSafetySettings;
}

export async function stalenessContext(db: Executor, rows: Pick<ServiceDayRow, 'blocks'>[]): Promise<StalenessContext> {
  const routeIds = new Set<string>();
  const profileIds = new Set<string>();
  for (const row of rows) {
    for (const block of row.blocks) {
      profileIds.add(block.vehicleProfileId);
      for (const trip of block.trips) routeIds.add(trip.routeId);
    }
  }
  const routeRows = routeIds.size
    ? await db
        .select({ id: roadRoutes.id, currentVersion: roadRoutes.currentVersion })
        .from(roadRoutes)
        .where(and(inArray(roadRoutes.id, [...routeIds]), isNull(roadRoutes.deletedAt)))
    : [];
  const profileRows = profileIds.size
    ? await db
        .select({ id: vehicleProfiles.id, updatedAt: vehicleProfiles.updatedAt })
        .from(vehicleProfiles)
        .where(and(inArray(vehicleProfiles.id, [...profileIds]), isNull(vehicleProfiles.deletedAt)))
    : [];
  return {
    routeVersions: new Map(routeRows.map((row) => [row.id, row.currentVersion])),
    profileUpdatedAt: new Map(profileRows.map((row) => [row.id, row.updatedAt.toISOString()])),
    safetySettings: await readSafetySettings(db),
  };
}

/** What changed since the stored result was computed, in plain words. */
export function staleReasons(row: ServiceDayRow, result: ServiceDayResultRow | undefined, context: StalenessContext): string[] {
  const provenance = result?.provenance;
  if (!provenance) return [];
  const reasons: string[] = [];
  if (provenance.revision !== row.revision) reasons.push('the service day was changed after the run');
  if (provenance.engineVersion !== ENGINE_VERSION) {
    reasons.push(`the calculation engine changed (${provenance.engineVersion} → ${ENGINE_VERSION})`);
  }
  const pinned = new Set<string>();
  for (const block of row.blocks) for (const trip of block.trips) if (trip.routeVersion !== undefined) pinned.add(trip.routeId);
  for (const [routeId, versions] of Object.entries(provenance.routeVersions)) {
    const current = context.routeVersions.get(routeId);
    if (current === undefined) reasons.push(`a route it runs (${routeId}) was deleted`);
    else if (!pinned.has(routeId) && !versions.includes(current)) reasons.push(`a route it runs has a newer version (${current})`);
  }
  for (const [profileId, updatedAt] of Object.entries(provenance.vehicleProfiles)) {
    const current = context.profileUpdatedAt.get(profileId);
    if (current === undefined) reasons.push(`a vehicle profile it uses (${profileId}) was deleted`);
    else if (current !== updatedAt) reasons.push('a vehicle profile it uses changed after the run');
  }
  const safety = safetySettingsChangedReason(provenance.safetySettings, context.safetySettings);
  if (safety) reasons.push(safety);
  return [...new Set(reasons)];
}

export function toServiceDay(row: ServiceDayRow, result: ServiceDayResultRow | undefined, context: StalenessContext): ServiceDay {
  const { blocks, chargers } = parseDocument(row);
  const reasons = staleReasons(row, result, context);
  return {
    id: row.id,
    name: row.name,
    dayType: row.dayType,
    season: row.season,
    batteryAge: row.batteryAge,
    reserveSoc: row.reserveSoc,
    inService: row.inService,
    chargers,
    blocks,
    status: result?.status ?? null,
    failureReason: result?.failureReason ?? null,
    isStale: reasons.length > 0,
    staleReasons: reasons,
    computedAt: result?.computedAt?.toISOString() ?? null,
    createdBy: row.createdByName,
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** Queues a run: a new or reset result row (the last good result stays), with no claim. */
export async function queueRun(db: Executor, serviceDayId: string, jobId: string | null) {
  const now = new Date();
  await db
    .insert(serviceDayResults)
    .values({ serviceDayId, status: 'queued', jobId, queuedAt: now })
    .onConflictDoUpdate({
      target: serviceDayResults.serviceDayId,
      set: { status: 'queued', jobId, queuedAt: now, claimToken: null, heartbeatAt: null, startedAt: null, failureReason: null },
    });
}

export async function setRunJobId(db: Executor, serviceDayId: string, jobId: string) {
  await db.update(serviceDayResults).set({ jobId }).where(eq(serviceDayResults.serviceDayId, serviceDayId));
}

/** Claims a queued run for this worker; undefined when another worker took it or it is not queued. */
export async function claimRun(db: Executor, serviceDayId: string, claimToken: string): Promise<ServiceDayResultRow | undefined> {
  const now = new Date();
  const [row] = await db
    .update(serviceDayResults)
    .set({ status: 'running', claimToken, heartbeatAt: now, startedAt: now })
    .where(and(eq(serviceDayResults.serviceDayId, serviceDayId), eq(serviceDayResults.status, 'queued')))
    .returning();
  return row;
}

export async function beatHeartbeat(db: Executor, serviceDayId: string, claimToken: string) {
  await db
    .update(serviceDayResults)
    .set({ heartbeatAt: new Date() })
    .where(and(eq(serviceDayResults.serviceDayId, serviceDayId), eq(serviceDayResults.claimToken, claimToken)));
}

/** Records the outcome if this worker still holds the claim; false when it lost it (re-queued meanwhile). */
export async function recordOutcome(
  db: Executor,
  serviceDayId: string,
  claimToken: string,
  values: Partial<typeof serviceDayResults.$inferInsert>,
): Promise<boolean> {
  const updated = await db
    .update(serviceDayResults)
    .set({ ...values, claimToken: null, heartbeatAt: null })
    .where(
      and(
        eq(serviceDayResults.serviceDayId, serviceDayId),
        eq(serviceDayResults.claimToken, claimToken),
        eq(serviceDayResults.status, 'running'),
      ),
    )
    .returning({ id: serviceDayResults.serviceDayId });
  return updated.length > 0;
}

/** Runs whose heartbeat stopped before `staleBefore` (their worker died): back to queued. */
export async function takeStalledRuns(db: Executor, staleBefore: Date): Promise<ServiceDayResultRow[]> {
  return db
    .update(serviceDayResults)
    .set({ status: 'queued', claimToken: null, heartbeatAt: null, queuedAt: new Date() })
    .where(and(eq(serviceDayResults.status, 'running'), lt(serviceDayResults.heartbeatAt, staleBefore)))
    .returning();
}

export type ServiceDayRowType = ServiceDayRow;
