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
 *   // once, where the feature wires itself (api/main.ts when RUN_WORKERS):
 *   await jobs.registerWorker<{ scenarioId: string }>('scenario-batch-run', async (data) => {
 *     await runBatch(deps, data.scenarioId);   // throw to fail the attempt; it is retried
 *   });
 *   // wherever work is requested:
 *   await jobs.send('scenario-batch-run', { scenarioId });
 *
 * Handlers must be idempotent: a job whose process died is handed out again after
 * `expireInSeconds`, and a failed attempt is retried up to `retryLimit` times.
 * Job names: kebab-case, the feature first (`terrain-ingest`, `scenario-batch-run`).
 */
export interface JobQueue {
  /** Queues a job; resolves once it is stored (or, inline, once it has run). */
  send(name: string, data: object, options?: JobOptions): Promise<void>;
  /** Runs `handler` for every job of that name, one at a time per process. */
  registerWorker<TData extends object>(
    name: string,
    handler: (data: TData) => Promise<void>,
    options?: JobOptions,
  ): Promise<void>;
  stop(): Promise<void>;
}

export interface JobOptions {
  /** Attempts after the first failure (default 2). */
  retryLimit?: number;
  /** Seconds before a running job counts as lost and is handed out again (default 1 hour). */
  expireInSeconds?: number;
}

const DEFAULT_RETRY_LIMIT = 2;
const DEFAULT_EXPIRE_SECONDS = 60 * 60;
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
  boss.on('error', (error) => console.error('[jobs] queue error:', error));
  await boss.start();

  const ensured = new Set<string>();
  async function ensureQueue(name: string, options: JobOptions = {}) {
    if (ensured.has(name)) return;
    if (!(await boss.getQueue(name))) {
      await boss.createQueue(name, {
        name,
        retryLimit: options.retryLimit ?? DEFAULT_RETRY_LIMIT,
        expireInSeconds: options.expireInSeconds ?? DEFAULT_EXPIRE_SECONDS,
      });
    }
    ensured.add(name);
  }

  return {
    async send(name, data, options = {}) {
      await ensureQueue(name, options);
      await boss.send(name, data, {
        retryLimit: options.retryLimit ?? DEFAULT_RETRY_LIMIT,
        expireInSeconds: options.expireInSeconds ?? DEFAULT_EXPIRE_SECONDS,
      });
    },
    async registerWorker(name, handler, options = {}) {
      await ensureQueue(name, options);
      await boss.work<never>(name, { batchSize: 1, pollingIntervalSeconds: 2 }, async (jobs) => {
        for (const job of jobs) await handler(job.data);
      });
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
export function createInlineJobQueue(): JobQueue & { idle(): Promise<void> } {
  const handlers = new Map<string, (data: never) => Promise<void>>();
  const running = new Set<Promise<void>>();
  return {
    async send(name, data) {
      const handler = handlers.get(name);
      if (!handler) throw new Error(`No worker registered for job "${name}"`);
      const run = handler(data as never)
        .catch((error: unknown) => console.error(`[jobs] inline job ${name} failed:`, error))
        .finally(() => running.delete(run));
      running.add(run);
    },
    async registerWorker(name, handler) {
      handlers.set(name, handler as (data: never) => Promise<void>);
    },
    async idle() {
      while (running.size > 0) await Promise.all([...running]);
    },
    async stop() {
      await Promise.all([...running]);
    },
  };
}

const attached = new WeakMap<object, JobQueue>();

/**
 * Makes `queue` the job queue of everything built on this database handle (api/main.ts calls it
 * once at start-up). Features look it up with `jobQueueOf(db)`; without one they run their jobs
 * in-process (tests, command-line tools).
 */
export function attachJobQueue(db: object, queue: JobQueue): void {
  attached.set(db, queue);
}

export function jobQueueOf(db: object): JobQueue | undefined {
  return attached.get(db);
}
