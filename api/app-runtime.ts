import type { AppDeps } from './app-deps';
import type { Config } from './config';
import type { Database } from './db/client';
import { createInlineJobQueue, type InlineJobQueue, type JobQueue } from './jobs/job-queue';
import { TerrainRuntime } from './terrain/terrain-runtime';

/**
 * What a process keeps for as long as its dependencies live: the terrain runtime (ready
 * catalogue, decoded-block cache with its decoder threads, file locations), the shared job queue
 * once one is started, and, where none runs (tests, command-line tools), an in-process job queue
 * per feature with that feature's workers on it.
 *
 * It travels in `AppDeps.runtime` by reference, so every copy of the dependencies (createApp and
 * withDefaultServices spread them) shares one runtime, as one process would.
 */
export class AppRuntime {
  /** The shared job queue (pg-boss) of this process, once `attachJobQueue` gave it one. */
  jobQueue: JobQueue | undefined;
  private terrainRuntime: TerrainRuntime | null = null;
  private readonly inlineQueues = new Map<string, Promise<InlineJobQueue>>();

  constructor(private readonly base: { db: Database; config: Config }) {}

  /** Terrain's per-process state, started on first use. */
  get terrain(): TerrainRuntime {
    this.terrainRuntime ??= new TerrainRuntime(this.base);
    return this.terrainRuntime;
  }

  /** Stops the decoder threads; the next use starts a fresh terrain runtime. */
  async closeTerrain(): Promise<void> {
    const runtime = this.terrainRuntime;
    this.terrainRuntime = null;
    await runtime?.close();
  }

  /**
   * The shared job queue, or the feature's in-process queue with its workers registered by
   * `register` on first use.
   */
  async jobsFor(feature: string, register: (queue: JobQueue) => Promise<void>): Promise<JobQueue> {
    if (this.jobQueue) return this.jobQueue;
    let queue = this.inlineQueues.get(feature);
    if (!queue) {
      queue = (async () => {
        const inline = createInlineJobQueue();
        await register(inline);
        return inline;
      })();
      this.inlineQueues.set(feature, queue);
    }
    return queue;
  }

  /** Resolves when the feature's in-process jobs sent so far have finished. */
  async inlineJobsIdle(feature: string): Promise<void> {
    await (await this.inlineQueues.get(feature))?.idle();
  }
}

/**
 * The runtime these dependencies carry, made and kept on them on first use when the caller built
 * them without one (a test's own `{ db, config }`, a command-line tool).
 */
export function runtimeOf(deps: AppDeps): AppRuntime {
  deps.runtime ??= new AppRuntime({ db: deps.db, config: deps.config });
  return deps.runtime;
}

/**
 * Makes `queue` the job queue of everything built on these dependencies (api/main.ts and
 * api/worker.ts call it once at start-up, through startTerrain). Without one, features run their
 * jobs in-process (tests, command-line tools).
 */
export function attachJobQueue(deps: AppDeps, queue: JobQueue): void {
  runtimeOf(deps).jobQueue = queue;
}

/** The shared job queue attached to these dependencies, if any. */
export function jobQueueOf(deps: AppDeps): JobQueue | undefined {
  return runtimeOf(deps).jobQueue;
}
