/**
 * Service days: saving them (every route, route version, vehicle profile and charger a block
 * names is checked, and a refusal names the block and the trip), restorable deletes with the
 * audit log, and runs through the job queue.
 *
 * A run is one job on the shared PostgreSQL queue (`service-day-run`). The worker claims the run
 * with a token, beats a heartbeat while it computes, prepares every route version and direction
 * the blocks run exactly as a scenario run prepares its trip (scenario-run.ts `scenarioTripPlan`
 * and the engine's `legRequest`),
 * samples elevations from the terrain for lines drawn without them, and runs the whole day on an
 * analysis worker thread (`runServiceDay`). Only the holder of the current claim records the
 * outcome; a failed run keeps the last good result beside its reason.
 */
import { randomUUID } from 'node:crypto';
import type { Season, VehicleProfile } from '@shared/domain/vehicle-profiles';
import type { ServiceDay, ServiceDayDraft, ServiceDayResult } from '@shared/domain/service-days';
import { scenarioOptionsSchema } from '@shared/domain/scenarios';
import type { ServiceDayEngineInput, ServiceDayRouteInput, ServiceDayVehicleInput } from '@shared/engine/service-day';
import { EngineInputError } from '@shared/engine/validation';
import type { AppDeps } from '../app-deps';
import { withDefaultServices } from '../app-services';
import { type Actor, recordAudit } from '../audit/audit-log';
import { readSafetySettings } from '../board/network-settings';
import type { Database, Executor } from '../db/client';
import type { ServiceDayRunProvenance } from '../db/schema/index';
import { ConflictError, HttpError, NotFoundError, UnprocessableError } from '../http/http-error';
import { jobQueueOf, runtimeOf } from '../app-runtime';
import type { JobPolicy, JobQueue } from '../jobs/job-queue';
import * as routes from '../road-routes/road-routes-repository';
import { heaviestMassKg, scenarioTripPlan } from '../scenarios/scenario-run';
import { legRequest } from '@shared/engine/round-trip';
import * as profiles from '../vehicle-profiles/vehicle-profiles-repository';
import * as repository from './service-days-repository';

export const SERVICE_DAY_RUN_JOB = 'service-day-run';
/** A day of 500 blocks takes well under a minute; a run lost with its process is retried once. */
export const SERVICE_DAY_RUN_POLICY: JobPolicy = { retryLimit: 1, expireInSeconds: 10 * 60 };
/** How often a running job says it is alive, and after how long without a beat it counts as lost, ms. */
export const HEARTBEAT_INTERVAL_MS = 10_000;
export const HEARTBEAT_STALE_MS = 60_000;
/** Route options of every trip of a service day: the scenario defaults (10 m spacing, 150 m smoothing, stops served). */
const TRIP_OPTIONS = scenarioOptionsSchema.parse({});

// ---------------------------------------------------------------- saving

/**
 * Checks what the draft refers to and how it hangs together; 422 naming the block and the trip
 * (`details.blockId`, `details.tripIndex`, `details.field`) at the first problem.
 */
export async function checkDraft(db: Executor, draft: ServiceDayDraft): Promise<void> {
  const refuse = (message: string, details: Record<string, unknown>, code = 'invalid_service_day'): never => {
    throw new UnprocessableError(message, code, details);
  };
  const chargerKeys = new Map<string, string>();
  draft.chargers.forEach((charger, index) => {
    if (chargerKeys.has(charger.key)) {
      refuse(`chargers[${index}].key: the key “${charger.key}” is used by another charger; each charger needs its own`, {
        field: `chargers[${index}].key`,
      });
    }
    chargerKeys.set(charger.key, charger.kind);
  });
  const blockIds = new Set<string>();
  const routeCache = new Map<string, Awaited<ReturnType<typeof routes.findRoute>> | null>();
  const profileCache = new Map<string, boolean>();
  for (const [blockIndex, block] of draft.blocks.entries()) {
    const where = `block “${block.blockId}” (blocks[${blockIndex}])`;
    const base = { blockId: block.blockId, blockIndex };
    if (blockIds.has(block.blockId))
      refuse(`${where}: another block has the same id; block ids must be unique within the day`, { ...base, field: 'blockId' });
    blockIds.add(block.blockId);
    if (block.depotChargerKey !== undefined) {
      const kind = chargerKeys.get(block.depotChargerKey);
      if (kind === undefined) {
        refuse(
          `${where}: depot charger “${block.depotChargerKey}” is not one of this day’s chargers`,
          { ...base, field: 'depotChargerKey' },
          'unknown_charger',
        );
      } else if (kind !== 'depot') {
        refuse(`${where}: charger “${block.depotChargerKey}” is a terminus charger, not a depot charger`, {
          ...base,
          field: 'depotChargerKey',
        });
      }
    }
    if (!profileCache.has(block.vehicleProfileId))
      profileCache.set(block.vehicleProfileId, !!(await profiles.findProfile(db, block.vehicleProfileId)));
    if (!profileCache.get(block.vehicleProfileId)) {
      refuse(`${where}: no vehicle profile ${block.vehicleProfileId}`, { ...base, field: 'vehicleProfileId' }, 'unknown_vehicle_profile');
    }
    const first = block.trips[0]!;
    if (block.pullOutS > first.departureS) {
      refuse(`${where}: pull-out at ${clock(block.pullOutS)} is after the first trip’s departure at ${clock(first.departureS)}`, {
        ...base,
        field: 'pullOutS',
      });
    }
    for (const [tripIndex, trip] of block.trips.entries()) {
      const tripWhere = `${where}, trip ${tripIndex + 1}`;
      const details = { ...base, tripIndex };
      if (tripIndex > 0 && trip.departureS <= block.trips[tripIndex - 1]!.departureS) {
        refuse(`${tripWhere}: departs at ${clock(trip.departureS)}, not after the trip before it; trips must be in time order`, {
          ...details,
          field: 'departureS',
        });
      }
      if (!routeCache.has(trip.routeId)) routeCache.set(trip.routeId, (await routes.findRoute(db, trip.routeId)) ?? null);
      const route = routeCache.get(trip.routeId);
      if (!route) refuse(`${tripWhere}: no route ${trip.routeId}`, { ...details, field: 'routeId' }, 'unknown_route');
      if (trip.routeVersion !== undefined && !(await routes.findVersion(db, trip.routeId, trip.routeVersion))) {
        refuse(
          `${tripWhere}: the route has no version ${trip.routeVersion} (latest is ${route!.currentVersion})`,
          { ...details, field: 'routeVersion' },
          'unknown_route_version',
        );
      }
    }
    const last = block.trips.at(-1)!;
    if (block.pullInS < last.departureS) {
      refuse(`${where}: pull-in at ${clock(block.pullInS)} is before the last trip’s departure at ${clock(last.departureS)}`, {
        ...base,
        field: 'pullInS',
      });
    }
  }
}

function draftColumns(draft: ServiceDayDraft) {
  return {
    name: draft.name,
    dayType: draft.dayType,
    season: draft.season,
    batteryAge: draft.batteryAge,
    reserveSoc: draft.reserveSoc,
    inService: draft.inService,
    chargers: draft.chargers,
    blocks: draft.blocks,
  };
}

export async function getServiceDay(db: Executor, id: string): Promise<ServiceDay> {
  const row = await repository.findServiceDayRow(db, id);
  if (!row) throw new NotFoundError('The service day');
  const result = await repository.findResultRow(db, id);
  return repository.toServiceDay(row, result, await repository.stalenessContext(db, [row]));
}

export async function listServiceDays(db: Executor, filter: { inService?: boolean } = {}) {
  const rows = await repository.listServiceDayRows(db, filter);
  const results = await repository.findResultRows(
    db,
    rows.map((row) => row.id),
  );
  const context = await repository.stalenessContext(db, rows);
  return rows.map((row) => {
    const {
      blocks: _blocks,
      chargers: _chargers,
      ...day
    } = repository.toServiceDay(
      row,
      results.find((result) => result.serviceDayId === row.id),
      context,
    );
    return { ...day, blockCount: row.blocks.length, tripCount: row.blocks.reduce((sum, block) => sum + block.trips.length, 0) };
  });
}

export async function createServiceDay(db: Database, actor: Actor, draft: ServiceDayDraft, seedKey?: string): Promise<ServiceDay> {
  await checkDraft(db, draft);
  const row = await db.transaction(async (tx) => {
    const inserted = await repository.insertServiceDay(tx, {
      ...draftColumns(draft),
      createdById: actor.id,
      createdByName: actor.name,
      seedKey: seedKey ?? null,
    });
    await recordAudit(tx, actor, { action: 'create', kind: 'service-day', entityId: inserted.id, entityName: inserted.name });
    return inserted;
  });
  return getServiceDay(db, row.id);
}

/** Saves the whole day; a result computed before is kept and shown stale until the next run. */
export async function updateServiceDay(db: Database, actor: Actor, id: string, draft: ServiceDayDraft): Promise<ServiceDay> {
  if (!(await repository.findServiceDayRow(db, id))) throw new NotFoundError('The service day');
  await checkDraft(db, draft);
  await db.transaction(async (tx) => {
    if (!(await repository.lockServiceDay(tx, id))) throw new NotFoundError('The service day');
    await repository.updateServiceDay(tx, id, draftColumns(draft));
    await recordAudit(tx, actor, { action: 'update', kind: 'service-day', entityId: id, entityName: draft.name });
  });
  return getServiceDay(db, id);
}

export async function deleteServiceDay(db: Database, actor: Actor, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const existing = await repository.lockServiceDay(tx, id);
    if (!existing) throw new NotFoundError('The service day');
    await repository.markServiceDayDeleted(tx, id, actor);
    await recordAudit(tx, actor, { action: 'delete', kind: 'service-day', entityId: id, entityName: existing.name });
  });
}

export async function restoreServiceDay(db: Database, actor: Actor, id: string): Promise<ServiceDay> {
  await db.transaction(async (tx) => {
    const existing = await repository.lockServiceDay(tx, id, true);
    if (!existing?.deletedAt) throw new NotFoundError('A deleted service day with that id');
    await repository.markServiceDayRestored(tx, id);
    await recordAudit(tx, actor, { action: 'restore', kind: 'service-day', entityId: id, entityName: existing.name });
  });
  return getServiceDay(db, id);
}

// ---------------------------------------------------------------- runs

async function registerServiceDayWorkers(deps: AppDeps, queue: JobQueue): Promise<void> {
  await queue.registerWorker<{ serviceDayId: string }>(
    SERVICE_DAY_RUN_JOB,
    (job) => runServiceDayJob(deps, job.serviceDayId),
    SERVICE_DAY_RUN_POLICY,
  );
}

/** The app's job queue, or (tests, the demo seed) an in-process queue with the run worker on it. */
function serviceDayJobs(deps: AppDeps): Promise<JobQueue> {
  return runtimeOf(deps).jobsFor('service-days', (queue) => registerServiceDayWorkers(deps, queue));
}

/** Resolves when in-process service-day runs have finished (tests and the demo seed). */
export async function waitForInlineServiceDayRuns(deps: AppDeps): Promise<void> {
  await runtimeOf(deps).inlineJobsIdle('service-days');
}

/** Registers the run worker on the shared queue (processes with RUN_WORKERS). */
export async function startServiceDayWorkers(deps: AppDeps): Promise<void> {
  const queue = jobQueueOf(deps);
  if (!queue) throw new Error('Attach the job queue (startTerrain) before starting the service-day workers');
  if (deps.config.RUN_WORKERS) await registerServiceDayWorkers(deps, queue);
}

/** Queues a run of the day as it is saved now; answers the day with status "queued". */
export async function requestRun(deps: AppDeps, id: string): Promise<ServiceDay> {
  if (!(await repository.findServiceDayRow(deps.db, id))) throw new NotFoundError('The service day');
  await repository.queueRun(deps.db, id, null);
  const queue = await serviceDayJobs(deps);
  const jobId = await queue.send(SERVICE_DAY_RUN_JOB, { serviceDayId: id }, SERVICE_DAY_RUN_POLICY);
  await repository.setRunJobId(deps.db, id, jobId);
  return getServiceDay(deps.db, id);
}

/** Runs whose worker stopped beating: queued again (maintenance sweep). Returns how many. */
export async function requeueStalledServiceDayRuns(deps: AppDeps, now = new Date()): Promise<number> {
  const stalled = await repository.takeStalledRuns(deps.db, new Date(now.getTime() - HEARTBEAT_STALE_MS));
  if (stalled.length === 0) return 0;
  const queue = await serviceDayJobs(deps);
  for (const run of stalled) {
    if (run.jobId) await queue.cancel(SERVICE_DAY_RUN_JOB, run.jobId).catch(() => undefined);
    const jobId = await queue.send(SERVICE_DAY_RUN_JOB, { serviceDayId: run.serviceDayId }, SERVICE_DAY_RUN_POLICY);
    await repository.setRunJobId(deps.db, run.serviceDayId, jobId);
  }
  return stalled.length;
}

/** One run. Idempotent: a run another worker holds, or that is not queued, is left alone. */
export async function runServiceDayJob(deps: AppDeps, serviceDayId: string): Promise<void> {
  const token = randomUUID();
  if (!(await repository.claimRun(deps.db, serviceDayId, token))) return;
  const heartbeat = setInterval(() => {
    void repository.beatHeartbeat(deps.db, serviceDayId, token).catch(() => undefined);
  }, HEARTBEAT_INTERVAL_MS);
  try {
    const row = await repository.findServiceDayRow(deps.db, serviceDayId);
    if (!row) {
      await repository.recordOutcome(deps.db, serviceDayId, token, {
        status: 'failed',
        failureReason: 'the service day was deleted before it ran',
      });
      return;
    }
    let outcome: Awaited<ReturnType<typeof computeServiceDay>>;
    try {
      outcome = await computeServiceDay(deps, row);
    } catch (error) {
      // Busy threads, a vanished terrain model, the database: the run failed; keep the last result.
      if (!(error instanceof HttpError)) console.error(`[service-days] run ${serviceDayId} failed:`, error);
      outcome = { ok: false, failureReason: error instanceof Error ? error.message : String(error) };
    }
    if (outcome.ok) {
      await repository.recordOutcome(deps.db, serviceDayId, token, {
        status: 'done',
        failureReason: null,
        engineVersion: outcome.engineVersion,
        computedAt: new Date(),
        provenance: outcome.provenance,
        result: outcome.result,
      });
    } else {
      await repository.recordOutcome(deps.db, serviceDayId, token, { status: 'failed', failureReason: outcome.failureReason });
    }
  } finally {
    clearInterval(heartbeat);
  }
}

type ComputeOutcome =
  | {
      ok: true;
      engineVersion: string;
      provenance: ServiceDayRunProvenance;
      result: { blocks: ServiceDayResult['blocks']; peakChargingPowerW: ServiceDayResult['peakChargingPowerW']; caution: string };
    }
  | { ok: false; failureReason: string };

/** Prepares the engine input of a saved day (module comment) and runs it on a worker thread. */
export async function computeServiceDay(deps: AppDeps, row: repository.ServiceDayRowType): Promise<ComputeOutcome> {
  const prepared = await prepareEngineInput(deps, row);
  if (!prepared.ok) return prepared;
  try {
    const result = await runtimeOf(deps).analysisPool.runServiceDay(prepared.input);
    return {
      ok: true,
      engineVersion: result.engineVersion,
      provenance: { ...prepared.provenance, engineVersion: result.engineVersion },
      result: { blocks: result.blocks, peakChargingPowerW: result.peakChargingPowerW, caution: result.caution },
    };
  } catch (error) {
    if (error instanceof EngineInputError) return { ok: false, failureReason: `the calculation refused an input: ${error.message}` };
    throw error;
  }
}

/** The engine input of a saved day, or why it cannot run (a route or profile deleted since, terrain missing). */
export async function prepareEngineInput(
  deps: AppDeps,
  row: repository.ServiceDayRowType,
): Promise<{ ok: true; input: ServiceDayEngineInput; provenance: ServiceDayRunProvenance } | { ok: false; failureReason: string }> {
  const { db } = deps;
  const { blocks, chargers } = repository.parseDocument(row);
  const profileList: VehicleProfile[] = [];
  const provenance: ServiceDayRunProvenance = { revision: row.revision, engineVersion: '', routeVersions: {}, vehicleProfiles: {} };
  for (const id of new Set(blocks.map((block) => block.vehicleProfileId))) {
    const profileRow = await profiles.findProfile(db, id);
    if (!profileRow) return { ok: false, failureReason: `vehicle profile ${id} was deleted; restore it or change the blocks that use it` };
    profileList.push(profiles.toVehicleProfile(profileRow));
    provenance.vehicleProfiles[id] = profileRow.updatedAt.toISOString();
  }
  const season = row.season as Season;
  const vehicles: ServiceDayVehicleInput[] = profileList.map((profile) => ({
    vehicleProfileId: profile.id,
    vehicle: { ...profile.vehicle, auxPowerW: profile.seasons[season].auxPowerW },
    loadsKg: profile.loadsKg,
    passengerMassKg: profile.passengerMassKg,
    ...(profile.climate ? { climate: profile.climate } : {}),
  }));
  const ambients = profileList.map((profile) => profile.seasons[season].ambientC);
  // One ambient for the day: the coldest of the profiles' in winter, the hottest in summer (the harder case), else the first.
  const ambientC = season === 'winter' ? Math.min(...ambients) : season === 'summer' ? Math.max(...ambients) : ambients[0]!;
  const safety = await readSafetySettings(db);
  provenance.safetySettings = { ...safety };
  // Descents' worst case with the heaviest of the day's vehicles (a route is prepared once for every vehicle).
  const heaviest = profileList.reduce((best, profile) => (heaviestMassKg(profile) > heaviestMassKg(best) ? profile : best));
  const sampler = withDefaultServices(deps).sampleElevations;
  const routeInputs: ServiceDayRouteInput[] = [];
  const seen = new Set<string>();
  for (const block of blocks) {
    for (const trip of block.trips) {
      const key = `${trip.routeId}|${trip.routeVersion ?? ''}|${trip.direction}`;
      if (seen.has(key)) continue;
      seen.add(key);
      const route = await routes.findRoute(db, trip.routeId);
      if (!route)
        return {
          ok: false,
          failureReason: `route ${trip.routeId} (block “${block.blockId}”) was deleted; restore it or change the blocks that run it`,
        };
      const versionNumber = trip.routeVersion ?? route.currentVersion;
      const version = await routes.findVersion(db, trip.routeId, versionNumber);
      if (!version) return { ok: false, failureReason: `route ${trip.routeId} has no version ${versionNumber}` };
      const ranVersions = (provenance.routeVersions[trip.routeId] ??= []);
      if (!ranVersions.includes(versionNumber)) ranVersions.push(versionNumber);
      // The scenario run's own preparation of one direction (line, speed limits, stops with dwell, safety settings).
      const plan = scenarioTripPlan(
        version,
        heaviest,
        {
          direction: trip.direction,
          load: { kind: 'case', case: 'seated' },
          season: { kind: 'season', season },
          startSoc: 0.9,
          options: TRIP_OPTIONS,
        },
        safety,
      );
      const directed = legRequest(plan, trip.direction, 0.9);
      const line = await withElevations(directed.route as Line, TRIP_OPTIONS.spacingM, sampler);
      if (!line) {
        return {
          ok: false,
          failureReason: `no terrain covers all of “${version.name}” (${trip.direction}); upload a terrain model that covers it, or give the route's positions elevations`,
        };
      }
      routeInputs.push({
        routeId: trip.routeId,
        ...(trip.routeVersion === undefined ? {} : { routeVersion: trip.routeVersion }),
        direction: trip.direction,
        name: `${version.name} ${trip.direction}`,
        route: line,
        options: directed.options ?? {},
      });
    }
  }
  return {
    ok: true,
    provenance,
    input: { ambientC, batteryAge: row.batteryAge, reserveSoc: row.reserveSoc, routes: routeInputs, vehicles, chargers, blocks },
  };
}

/**
 * The line with an elevation at every position: as drawn when every position has one; otherwise
 * cut every `spacingM` and sampled from the terrain (the scenario run samples at its resampled
 * points the same way). Null when some point has no terrain under it.
 */
type Line = ServiceDayRouteInput['route'];

async function withElevations(
  line: Line,
  spacingM: number,
  sample: ((points: [number, number][]) => Promise<(number | null)[]>) | undefined,
): Promise<Line | null> {
  if (line.coordinates.every((position) => position.length >= 3 && Number.isFinite(position[2]))) return line;
  if (!sample) return null;
  const points: [number, number][] = [];
  for (let i = 0; i < line.coordinates.length; i++) {
    const [lon, lat] = line.coordinates[i] as [number, number];
    if (i > 0) {
      const [lon0, lat0] = line.coordinates[i - 1] as [number, number];
      const pieces = Math.ceil(haversineM(lon0, lat0, lon, lat) / spacingM);
      for (let k = 1; k < pieces; k++) points.push([lon0 + ((lon - lon0) * k) / pieces, lat0 + ((lat - lat0) * k) / pieces]);
    }
    points.push([lon, lat]);
  }
  const elevations = await sample(points);
  if (elevations.some((z) => typeof z !== 'number' || !Number.isFinite(z))) return null;
  return { type: 'LineString', coordinates: points.map(([lon, lat], i) => [lon, lat, elevations[i]!]) };
}

function haversineM(lon1: number, lat1: number, lon2: number, lat2: number): number {
  const rad = Math.PI / 180;
  const a =
    Math.sin(((lat2 - lat1) * rad) / 2) ** 2 + Math.cos(lat1 * rad) * Math.cos(lat2 * rad) * Math.sin(((lon2 - lon1) * rad) / 2) ** 2;
  return 2 * 6_371_008.8 * Math.asin(Math.sqrt(a));
}

export async function getResult(db: Executor, id: string): Promise<ServiceDayResult> {
  if (!(await repository.findServiceDayRow(db, id))) throw new NotFoundError('The service day');
  const row = await repository.findResultRow(db, id);
  if (!row) throw new HttpError(404, 'no_result', 'The service day has not been run yet; run it first (POST …/run)', { status: null });
  if (!row.result || !row.computedAt || !row.engineVersion) {
    if (row.status === 'queued' || row.status === 'running') {
      throw new ConflictError(`The service day’s first run is ${row.status}; its result is not ready yet`, 'run_in_progress', {
        status: row.status,
      });
    }
    throw new HttpError(404, 'no_result', `The service day has no result: ${row.failureReason ?? 'the run failed'}`, {
      status: row.status,
      failureReason: row.failureReason,
    });
  }
  return {
    serviceDayId: id,
    engineVersion: row.engineVersion,
    computedAt: row.computedAt.toISOString(),
    blocks: row.result.blocks,
    peakChargingPowerW: row.result.peakChargingPowerW,
    caution: row.result.caution,
  };
}

function clock(seconds: number): string {
  const h = Math.floor(seconds / 3600);
  const m = Math.floor((seconds % 3600) / 60);
  return `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}`;
}
