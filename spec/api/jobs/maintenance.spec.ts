import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { createApp } from '../../../api/app';
import { BATCH_RUN_JOB, BATCH_RUN_JOB_POLICY, BATCH_STALE_MS, runBatchItem } from '../../../api/batch-runs/batch-runs-service';
import { claimItem, finishItem } from '../../../api/batch-runs/batch-runs-repository';
import { batchRunItems, scenarios, terrainModels } from '../../../api/db/schema/index';
import { attachJobQueue } from '../../../api/app-runtime';
import { startJobQueue, type JobQueue, type JobState } from '../../../api/jobs/job-queue';
import { runMaintenance } from '../../../api/jobs/maintenance';
import { TERRAIN_INGEST_JOB } from '../../../api/terrain/ingestion/terrain-ingestion';
import { closeTerrainRuntime } from '../../../api/terrain/terrain-runtime';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { aRouteDraft, eastwardLine } from '../../support/road-route-builders';
import { sessionCookies } from '../../support/session-cookie';
import { createTestContext } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

const dataDir = mkdtempSync(join(tmpdir(), 'descentry-maintenance-'));
const context = createTestContext({ DATA_DIR: dataDir });
const { db } = context;
const queue = recordingQueue();
attachJobQueue(context.deps, queue.queue);
const app = createApp(context.deps);
let cookieFor: ReturnType<typeof sessionCookies>;
const DEAD_TOKEN = '00000000-0000-4000-8000-00000000dead';

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
  queue.reset();
});
afterAll(async () => {
  await closeTerrainRuntime(context.deps);
  await context.close();
  rmSync(dataDir, { recursive: true, force: true });
});

describe('the maintenance sweep (issue 11)', () => {
  it('queues a network-run item again when its worker stops beating, cancelling the dead job; the late worker cannot record over it', async () => {
    const { runId, scenarioId } = await aStartedRun();
    const firstJob = queue.sent[0]!.id;
    queue.states.set(firstJob, 'active');
    await claimItem(db, runId, scenarioId, DEAD_TOKEN);
    await db.update(batchRunItems).set({ heartbeatAt: new Date(Date.now() - 2 * BATCH_STALE_MS) });

    const report = await runMaintenance(context.deps);
    const [item] = await db.select().from(batchRunItems);
    const lateRecord = await finishItem(db, runId, scenarioId, DEAD_TOKEN, { error: null });
    await runBatchItem(context.deps, { batchRunId: runId, scenarioId });
    const [finished] = await db.select().from(batchRunItems);

    expect(report.batchItemsRequeued).toBe(1);
    expect(queue.cancelled).toEqual([firstJob]);
    expect(queue.sent).toHaveLength(2);
    expect(queue.sent[1]).toMatchObject({ name: BATCH_RUN_JOB, data: { batchRunId: runId, scenarioId } });
    expect(item).toMatchObject({ status: 'queued', jobId: queue.sent[1]!.id, claimToken: null });
    expect(lateRecord).toBe(false);
    expect(finished).toMatchObject({ status: 'done', error: null });
  });

  it('leaves a running item alone while its worker beats', async () => {
    const { runId, scenarioId } = await aStartedRun();
    await claimItem(db, runId, scenarioId, crypto.randomUUID());

    const report = await runMaintenance(context.deps);

    expect(report.batchItemsRequeued).toBe(0);
    expect(queue.sent).toHaveLength(1);
  });

  it('gives a queued item a new job when the queue no longer holds its job', async () => {
    await aStartedRun();
    queue.states.set(queue.sent[0]!.id, 'failed');

    const report = await runMaintenance(context.deps);

    expect(report.batchItemsRequeued).toBe(1);
    expect(queue.sent).toHaveLength(2);
  });

  it('marks a scenario left "running" by a dead process failed, keeping its last result', async () => {
    const { scenarioId } = await aScenario();
    await db.update(scenarios).set({ status: 'running', updatedAt: new Date(Date.now() - 10 * 60_000) });

    const report = await runMaintenance(context.deps);
    const [row] = await db.select().from(scenarios).where(eq(scenarios.id, scenarioId));

    expect(report.scenarioRunsFailed).toBe(1);
    expect(row).toMatchObject({ status: 'failed', failureReason: expect.stringMatching(/stopped before it finished/) });
    expect(row!.summary).not.toBeNull();
  });

  it('queues a terrain model again when its ingestion stops beating, cancelling the job left active (issue 11)', async () => {
    const alive = await aProcessingModel('alive', { heartbeatAgoMs: 1_000, jobState: 'active' });
    const dead = await aProcessingModel('dead', { heartbeatAgoMs: 10 * 60_000, jobState: 'active' });
    const lost = await aProcessingModel('lost', { heartbeatAgoMs: 10 * 60_000, jobState: 'active', withoutFile: true });

    const report = await runMaintenance(context.deps);
    const rows = await db
      .select({ id: terrainModels.id, status: terrainModels.status, ingestJobId: terrainModels.ingestJobId })
      .from(terrainModels);
    const byId = new Map(rows.map((row) => [row.id, row]));

    expect(report).toMatchObject({ ingestionRequeued: 1, ingestionFailed: 1 });
    expect(queue.cancelled).toEqual([`job-of-${dead}`]);
    expect(queue.sent.map((job) => job.name)).toEqual([TERRAIN_INGEST_JOB]);
    expect(byId.get(dead)!.ingestJobId).toBe(queue.sent[0]!.id);
    expect(byId.get(alive)!.ingestJobId).toBe(`job-of-${alive}`);
    expect(byId.get(lost)!.status).toBe('failed');
  });
});

describe('job policies on the PostgreSQL queue (issue 11)', () => {
  it('stores network-run jobs with their ten-minute expiry, also on a queue made under an older policy', async () => {
    const older = await startJobQueue(context.deps.config.DATABASE_URL);
    await older.send(BATCH_RUN_JOB, { batchRunId: 'none', scenarioId: 'none' }, { retryLimit: 0, expireInSeconds: 3_600 });
    await older.stop();
    const current = await startJobQueue(context.deps.config.DATABASE_URL);

    const jobId = await current.send(BATCH_RUN_JOB, { batchRunId: 'none', scenarioId: 'none' }, BATCH_RUN_JOB_POLICY);
    const rows = await db.execute<{ expire_s: number; queue_expire_s: number; retry_limit: number }>(sql`
      select extract(epoch from j.expire_in)::int as expire_s, q.expire_seconds as queue_expire_s, j.retry_limit
      from pgboss.job j join pgboss.queue q on q.name = j.name where j.id = ${jobId}::uuid`);
    await current.cancel(BATCH_RUN_JOB, jobId);
    await current.stop();

    expect([...rows][0]).toEqual({ expire_s: 600, queue_expire_s: 600, retry_limit: 0 });
  });
});

// Helpers

async function aScenario(): Promise<{ scenarioId: string }> {
  const planner = await cookieFor('planner');
  const route = await request(app)
    .post('/api/routes')
    .set('Cookie', planner)
    .send(aRouteDraft({ geometry: eastwardLine({ lengthM: 2_000, dropM: 150 }), stops: [], speedLimits: [] }));
  const scenario = await request(app)
    .post('/api/scenarios')
    .set('Cookie', planner)
    .send({ name: 'Swept', routeId: route.body.id, vehicleProfileId: presetProfileId('battery-bus-12m'), inService: true });
  if (scenario.status !== 201) throw new Error(`scenario: ${scenario.status} ${scenario.text}`);
  return { scenarioId: scenario.body.id };
}

async function aStartedRun(): Promise<{ runId: string; scenarioId: string }> {
  const { scenarioId } = await aScenario();
  const run = await request(app)
    .post('/api/batch-runs')
    .set('Cookie', await cookieFor('analyst'));
  if (run.status !== 202) throw new Error(`run: ${run.status} ${run.text}`);
  return { runId: run.body.id, scenarioId };
}

async function aProcessingModel(
  name: string,
  options: { heartbeatAgoMs: number; jobState: JobState; withoutFile?: boolean },
): Promise<string> {
  const id = crypto.randomUUID();
  const storedPath = join('terrain', id, 'model.tif');
  if (!options.withoutFile) {
    mkdirSync(join(dataDir, 'terrain', id), { recursive: true });
    writeFileSync(join(dataDir, storedPath), 'not read by this test');
  }
  await db.insert(terrainModels).values({
    id,
    name,
    status: 'processing',
    originalFileName: `${name}.tif`,
    storedPath,
    sha256: id,
    fileSizeBytes: 10,
    crs: 'EPSG:32632',
    proj4Definition: '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs',
    widthPx: 10,
    heightPx: 10,
    blockWidthPx: 10,
    blockHeightPx: 10,
    originX: 640_000,
    originY: 5_160_000,
    pixelSizeX: 20,
    pixelSizeY: -20,
    resolutionM: 20,
    dataType: 'Float32',
    pixelType: 'area',
    verticalUnit: 'metre',
    ingestJobId: `job-of-${id}`,
    ingestHeartbeatAt: new Date(Date.now() - options.heartbeatAgoMs),
  });
  queue.states.set(`job-of-${id}`, options.jobState);
  return id;
}

/** A queue that records what is sent and cancelled, and answers job states the spec sets. */
function recordingQueue() {
  const sent: { name: string; data: object; id: string }[] = [];
  const cancelled: string[] = [];
  const states = new Map<string, JobState>();
  const queue: JobQueue = {
    async send(name, data) {
      const id = crypto.randomUUID();
      sent.push({ name, data, id });
      states.set(id, 'created');
      return id;
    },
    async registerWorker() {},
    async jobState(_name, jobId) {
      const state = states.get(jobId);
      return state ? { state, startedOn: new Date(0) } : null;
    },
    async cancel(_name, jobId) {
      cancelled.push(jobId);
      states.set(jobId, 'cancelled');
    },
    async stop() {},
  };
  return {
    queue,
    sent,
    cancelled,
    states,
    reset() {
      sent.length = 0;
      cancelled.length = 0;
      states.clear();
    },
  };
}
