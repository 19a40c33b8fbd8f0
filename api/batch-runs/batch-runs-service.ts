/**
 * Network-wide runs: every in-service scenario re-run as one job each on the shared PostgreSQL
 * job queue, so every worker process (API processes with RUN_WORKERS, or `api/worker.ts`) takes
 * a share. A scenario that fails (say, a route leaving the terrain coverage) is recorded as
 * failed with its reason; the others carry on.
 */
import { randomUUID } from 'node:crypto';
import type { User } from '@shared/domain/auth';
import type { BatchRun } from '@shared/domain/board-summary';
import type { AppDeps } from '../app-deps';
import { ConflictError, NotFoundError } from '../http/http-error';
import { jobQueueOf, runtimeOf } from '../app-runtime';
import { type JobPolicy, type JobQueue } from '../jobs/job-queue';
import { listInServiceScenarioNames } from '../scenarios/scenarios-repository';
import * as repository from './batch-runs-repository';
import { runScenarioForBatch, type BatchScenarioRunner } from './scenario-runner';

export const BATCH_RUN_JOB = 'scenario-batch-run';
/**
 * No retries (a scenario that cannot run is the item's result, not the job's); ten minutes before
 * pg-boss itself gives up on a lost job. A worker that dies is found much sooner by its heartbeat.
 */
export const BATCH_RUN_JOB_POLICY: JobPolicy = { retryLimit: 0, expireInSeconds: 10 * 60 };
/** How often a running item's worker says it is alive, ms. */
export const BATCH_HEARTBEAT_MS = 15_000;
/** Silence after which a running item counts as abandoned and is queued again, ms. */
export const BATCH_STALE_MS = 4 * BATCH_HEARTBEAT_MS;

export interface BatchRunJob {
  batchRunId: string;
  scenarioId: string;
}

export async function startBatchRun(deps: AppDeps, user: User): Promise<BatchRun> {
  const inService = await listInServiceScenarioNames(deps.db);
  if (inService.length === 0) {
    throw new ConflictError('No scenario is marked in service; mark scenarios in service before a network-wide run', 'nothing_in_service');
  }
  return startScenarioReruns(deps, user, inService, null);
}

/**
 * Re-runs the given scenarios as one batch (one queued job each), e.g. every scenario of a
 * vehicle profile after a new version of it; `reason` says why.
 */
export async function startScenarioReruns(
  deps: AppDeps,
  startedBy: { id: string | null; name: string },
  scenarioList: Array<{ id: string; name: string }>,
  reason: string | null,
): Promise<BatchRun> {
  const { run, items } = await deps.db.transaction((tx) => repository.insertBatchRun(tx, startedBy, scenarioList, reason));
  const queue = await batchJobs(deps);
  for (const item of items) {
    const jobId = await queue.send(
      BATCH_RUN_JOB,
      { batchRunId: run.id, scenarioId: item.scenarioId } satisfies BatchRunJob,
      BATCH_RUN_JOB_POLICY,
    );
    await repository.replaceItemJob(deps.db, run.id, item.scenarioId, null, jobId);
  }
  return repository.toBatchRun(run, items);
}

export async function getBatchRun(deps: AppDeps, batchRunId: string): Promise<BatchRun> {
  const found = await repository.findBatchRun(deps.db, batchRunId);
  if (!found) throw new NotFoundError('Batch run');
  return repository.toBatchRun(found.run, found.items);
}

export async function listBatchRuns(deps: AppDeps): Promise<Array<Omit<BatchRun, 'items'>>> {
  return (await repository.listBatchRuns(deps.db)).map(({ run, items }) => {
    const { items: _items, ...summary } = repository.toBatchRun(
      run,
      items.map((item) => ({ ...item, scenarioId: '', scenarioName: '' })),
    );
    return summary;
  });
}

/**
 * Runs one scenario of a batch. Idempotent: an item another worker already took or finished is
 * left alone, and an item queued again after this worker fell silent is recorded by the worker
 * that holds it now, not by this one. The scenario's own failure is the item's result, not the
 * job's, so the queue does not retry a route that cannot run.
 */
export async function runBatchItem(deps: AppDeps, job: BatchRunJob, runScenario: BatchScenarioRunner = runScenarioForBatch): Promise<void> {
  const claimToken = randomUUID();
  const claimed = await repository.claimItem(deps.db, job.batchRunId, job.scenarioId, claimToken);
  if (!claimed) return;
  const heartbeat = setInterval(() => {
    // A missed beat (database briefly away) is made up by the next one.
    repository.beatItem(deps.db, job.batchRunId, job.scenarioId, claimToken).catch(() => undefined);
  }, BATCH_HEARTBEAT_MS);
  let error: string | null = null;
  try {
    await runScenario(deps, job.scenarioId);
  } catch (failure) {
    // Expected: the scenario cannot run (no terrain under the route, deleted in the meantime,
    // invalid inputs). Record why and let the rest of the batch go on.
    error = failure instanceof Error ? failure.message : String(failure);
  } finally {
    clearInterval(heartbeat);
  }
  if (await repository.finishItem(deps.db, job.batchRunId, job.scenarioId, claimToken, { error })) {
    await repository.finishRunIfComplete(deps.db, job.batchRunId);
  }
}

/**
 * Part of the maintenance sweep (at start-up and every minute): items whose worker stopped
 * beating are queued again with a new job (the old one is cancelled if the queue still holds it
 * as active), and queued items whose job is gone from the queue (failed, cancelled, lost) get a
 * new one. Returns how many items were queued again.
 */
export async function requeueStaleBatchItems(deps: AppDeps, now = new Date()): Promise<number> {
  const queue = await batchJobs(deps);
  let requeued = 0;
  for (const item of await repository.releaseStaleItems(deps.db, new Date(now.getTime() - BATCH_STALE_MS))) {
    if (item.jobId && (await queue.jobState(BATCH_RUN_JOB, item.jobId))?.state === 'active') await queue.cancel(BATCH_RUN_JOB, item.jobId);
    await resendItem(deps, queue, item, item.jobId);
    requeued++;
  }
  for (const item of await repository.listQueuedItems(deps.db)) {
    const job = item.jobId ? await queue.jobState(BATCH_RUN_JOB, item.jobId) : null;
    if (job && (job.state === 'created' || job.state === 'retry' || job.state === 'active')) continue;
    await resendItem(deps, queue, item, item.jobId);
    requeued++;
  }
  return requeued;
}

async function resendItem(deps: AppDeps, queue: JobQueue, item: BatchRunJob, previousJobId: string | null): Promise<void> {
  // Another sweeper may be at the same item: only the one that swaps the job id in sends.
  const placeholder = `resending:${randomUUID()}`;
  if (!(await repository.replaceItemJob(deps.db, item.batchRunId, item.scenarioId, previousJobId, placeholder))) return;
  const jobId = await queue.send(
    BATCH_RUN_JOB,
    { batchRunId: item.batchRunId, scenarioId: item.scenarioId } satisfies BatchRunJob,
    BATCH_RUN_JOB_POLICY,
  );
  await repository.replaceItemJob(deps.db, item.batchRunId, item.scenarioId, placeholder, jobId);
}

/** Registers the batch worker on a queue (api/main.ts and api/worker.ts when RUN_WORKERS). */
export async function registerBatchRunWorkers(deps: AppDeps, queue: JobQueue, runScenario?: BatchScenarioRunner): Promise<void> {
  await queue.registerWorker<BatchRunJob>(BATCH_RUN_JOB, (job) => runBatchItem(deps, job, runScenario), BATCH_RUN_JOB_POLICY);
}

/** The app's job queue, or (tests, CLI tools) an in-process queue with the batch worker on it. */
function batchJobs(deps: AppDeps): Promise<JobQueue> {
  return runtimeOf(deps).jobsFor('batch-runs', (queue) => registerBatchRunWorkers(deps, queue));
}

/** Resolves when in-process batch jobs have finished (tests and the demo seed). */
export async function waitForInlineBatchJobs(deps: AppDeps): Promise<void> {
  await runtimeOf(deps).inlineJobsIdle('batch-runs');
}

/**
 * Puts the batch worker on the process's job queue when this process runs workers (api/main.ts
 * after the queue is attached, and api/worker.ts).
 */
export async function startBatchRunWorkers(deps: AppDeps): Promise<void> {
  const queue = jobQueueOf(deps);
  if (!queue) throw new Error('Attach the job queue (startTerrain) before starting the batch workers');
  if (deps.config.RUN_WORKERS) await registerBatchRunWorkers(deps, queue);
}
