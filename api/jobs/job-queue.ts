import { randomUUID } from 'node:crypto';
import PgBoss from 'pg-boss';

/**
 * Background jobs for the whole API (terrain ingestion now, batch scenario runs later).
 *
 * Jobs live in PostgreSQL through pg-boss, in its own `pgboss` schema next to the application's
 * tables, so any number of API or worker processes can share one queue: a process that sends a
 * job need not be the one that runs it (RUN_WORKERS decides who works).
 *
 * How a feature uses it:
 *
 *   const POLICY = { retryLimit: 0, expireInSeconds: 600 };   // one per kind of job
 *   // once, where the feature wires itself (api/main.ts when RUN_WORKERS):
 *   await jobs.registerWorker<{ scenarioId: string }>('scenario-batch-run', async (data, jobId) => {
 *     await runBatch(deps, data.scenarioId);   // throw to fail the attempt; it is retried
 *   }, POLICY);
 *   // wherever work is requested:
 *   const jobId = await jobs.send('scenario-batch-run', { scenarioId }, POLICY);
 *
 * Handlers must be idempotent: a job whose process died is handed out again after
 * `expireInSeconds`, and a failed attempt is retried up to `retryLimit` times. Work that must
 * not wait that long records a heartbeat while it runs, and the maintenance sweep
 * (api/jobs/maintenance.ts) re-queues what has stopped beating.
 * Job names: kebab-case, the feature first (`terrain-ingest`, `scenario-batch-run`).
 */
export interface JobQueue {
  /** Queues a job with its kind's policy; resolves with the job's id once it is stored (or, inline, once it has started). */
  send(name: string, data: object, policy: JobPolicy): Promise<string>;
  /** Runs `handler` for every job of that name, one at a time per process. */
  registerWorker<TData extends object>(
    name: string,
    handler: (data: TData, jobId: string) => Promise<void>,
    policy: JobPolicy,
  ): Promise<void>;
  /** Where a job stands and when it started; null once the queue has forgotten it (archived long ago) or never had it. */
  jobState(name: string, jobId: string): Promise<{ state: JobState; startedOn: Date | null } | null>;
  /** Takes a job out of the queue (a job whose worker died while it was active). */
  cancel(name: string, jobId: string): Promise<void>;
  stop(): Promise<void>;
}

export type JobState = 'created' | 'retry' | 'active' | 'completed' | 'cancelled' | 'failed';

/**
 * How the queue treats one kind of job. Every send and the worker use the same policy (stored on
 * the queue too), so a job never runs on another kind's defaults.
 */
export interface JobPolicy {
  /** Attempts after the first failure. */
  retryLimit: number;
  /** Seconds before a running job counts as lost: it is then retried, or failed past the retry limit. */
  expireInSeconds: number;
}

/** The job queue's own schema; the application's migrations never touch it. */
export const JOB_QUEUE_SCHEMA = 'pgboss';

/** Starts pg-boss against DATABASE_URL (creating or migrating its schema on first start). */
export async function startJobQueue(databaseUrl: string): Promise<JobQueue> {
  const boss = new PgBoss({
    connectionString: databaseUrl,
    schema: JOB_QUEUE_SCHEMA,
    max: 4,
    // Look for new jobs every 2 s: ingestion should start promptly after an upload.
    pollingIntervalSeconds: 2,
  } as PgBoss.ConstructorOptions);
  boss.on('error', (error) => console.error('[jobs] queue error:', error instanceof Error ? error.message : error));
  await boss.start();

  const ensured = new Map<string, JobPolicy>();
  async function ensureQueue(name: string, policy: JobPolicy) {
    const known = ensured.get(name);
    if (known && known.retryLimit === policy.retryLimit && known.expireInSeconds === policy.expireInSeconds) return;
    const existing = await boss.getQueue(name);
    if (!existing) {
      await boss.createQueue(name, { name, ...policy });
    } else if (existing.retryLimit !== policy.retryLimit || existing.expireInSeconds !== policy.expireInSeconds) {
      // A queue made under an older policy (pg-boss keeps it in its schema) follows the current one.
      await boss.updateQueue(name, { name, ...policy });
    }
    ensured.set(name, policy);
  }

  return {
    async send(name, data, policy) {
      await ensureQueue(name, policy);
      const id = await boss.send(name, data, { ...policy });
      if (!id) throw new Error(`The job queue did not accept a "${name}" job`);
      return id;
    },
    async registerWorker(name, handler, policy) {
      await ensureQueue(name, policy);
      await boss.work<never>(name, { batchSize: 1, pollingIntervalSeconds: 2 }, async (jobs) => {
        for (const job of jobs) await handler(job.data, job.id);
      });
    },
    async jobState(name, jobId) {
      const job = await boss.getJobById(name, jobId, { includeArchive: true });
      return job ? { state: job.state, startedOn: job.startedOn ?? null } : null;
    },
    async cancel(name, jobId) {
      await boss.cancel(name, jobId);
    },
    async stop() {
      await boss.stop({ graceful: true, timeout: 10_000 });
    },
  };
}

/**
 * A queue that runs each job in this process right after it is sent, without retries. For tests
 * and command-line tools (the demo seed) that have no worker process to hand the job to.
 * `idle()` resolves when every job sent so far has finished.
 */
/** An in-process queue; `idle()` resolves when every job sent so far has finished. */
export type InlineJobQueue = JobQueue & { idle(): Promise<void> };

export function createInlineJobQueue(): InlineJobQueue {
  const handlers = new Map<string, (data: never, jobId: string) => Promise<void>>();
  const running = new Set<Promise<void>>();
  const states = new Map<string, { state: JobState; startedOn: Date | null }>();
  return {
    async send(name, data) {
      const handler = handlers.get(name);
      if (!handler) throw new Error(`No worker registered for job "${name}"`);
      const id = randomUUID();
      const startedOn = new Date();
      states.set(id, { state: 'active', startedOn });
      const run = handler(data as never, id)
        .then(
          () => void states.set(id, { state: 'completed', startedOn }),
          (error: unknown) => {
            states.set(id, { state: 'failed', startedOn });
            console.error(`[jobs] inline job ${name} failed:`, error);
          },
        )
        .finally(() => running.delete(run));
      running.add(run);
      return id;
    },
    async registerWorker(name, handler) {
      handlers.set(name, handler as (data: never, jobId: string) => Promise<void>);
    },
    async jobState(_name, jobId) {
      return states.get(jobId) ?? null;
    },
    async cancel(_name, jobId) {
      states.set(jobId, { state: 'cancelled', startedOn: states.get(jobId)?.startedOn ?? null });
    },
    async idle() {
      while (running.size > 0) await Promise.all([...running]);
    },
    async stop() {
      await Promise.all([...running]);
    },
  };
}
