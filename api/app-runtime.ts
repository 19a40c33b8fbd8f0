import type { AppDeps } from './app-deps';
import { AnalysisPool, analysisPoolOptions } from './analysis/analysis-pool';
import { SessionCache } from './auth/session-cache';
import { ActiveBasemapReader } from './basemap/active-basemap';
import { BasemapStorage } from './basemap/basemap-storage';
import type { Config } from './config';
import type { Database } from './db/client';
import { AnswerCache } from './http/answer-cache';
import { BuiltAnswers } from './http/built-answers';
import { createInlineJobQueue, type InlineJobQueue, type JobQueue } from './jobs/job-queue';
import { TerrainRuntime } from './terrain/terrain-runtime';

/**
 * What a process keeps for as long as its dependencies live, each part made on first use:
 * - the terrain runtime (ready catalogue, decoded-block cache with its decoder threads, file
 *   locations);
 * - the session cache and the answer cache of the lists, each listening on its announcement line
 *   (api/auth/session-cache.ts, api/http/answer-cache.ts);
 * - the built answers of the reads whose ETag is made from their identity, kept by it
 *   (api/http/built-answers.ts);
 * - the analysis threads (api/analysis/analysis-pool.ts);
 * - the base-map storage on disk and the active import as this process knows it (api/basemap/);
 * - the shared job queue once one is started, and, where none runs (tests, command-line tools),
 *   an in-process job queue per feature with that feature's workers on it.
 *
 * It travels in `AppDeps.runtime` by reference, so every copy of the dependencies (createApp and
 * withDefaultServices spread them) shares one runtime, as one process would. `close` stops what
 * holds threads or connections (shutdown, the end of a test file); a part used after that is made
 * afresh.
 */
export class AppRuntime {
  /** The shared job queue (pg-boss) of this process, once `attachJobQueue` gave it one. */
  jobQueue: JobQueue | undefined;
  private terrainRuntime: TerrainRuntime | null = null;
  private sessions: SessionCache | null = null;
  private answers: AnswerCache | null = null;
  private built: BuiltAnswers | null = null;
  private pool: AnalysisPool | null = null;
  private storage: BasemapStorage | null = null;
  private basemapReader: ActiveBasemapReader | null = null;
  private readonly inlineQueues = new Map<string, Promise<InlineJobQueue>>();

  constructor(private readonly base: { db: Database; config: Config }) {}

  /** The process's memory of live sessions, listening for changes from its first use. */
  get sessionCache(): SessionCache {
    if (!this.sessions) {
      this.sessions = new SessionCache(this.base.db.$client);
      this.sessions.start();
    }
    return this.sessions;
  }

  /** The process's answers of the busiest lists, listening for changes from its first use. */
  get answerCache(): AnswerCache {
    if (!this.answers) {
      this.answers = new AnswerCache(this.base.db.$client);
      this.answers.start();
    }
    return this.answers;
  }

  /** Built answers kept by their identity-made ETag (nothing to invalidate: a change makes a new key). */
  get builtAnswers(): BuiltAnswers {
    this.built ??= new BuiltAnswers();
    return this.built;
  }

  /** The analysis threads (started lazily by the pool itself). */
  get analysisPool(): AnalysisPool {
    this.pool ??= new AnalysisPool(analysisPoolOptions(this.base.config));
    return this.pool;
  }

  /** Uploaded and waiting extracts under DATA_DIR. */
  get basemapStorage(): BasemapStorage {
    this.storage ??= new BasemapStorage(this.base.config.DATA_DIR);
    return this.storage;
  }

  /** The active base-map import as this process knows it. */
  get activeBasemap(): ActiveBasemapReader {
    this.basemapReader ??= new ActiveBasemapReader(this.base.db);
    return this.basemapReader;
  }

  /** Stops the analysis threads; the next analysis starts a fresh pool. */
  async closeAnalysisPool(): Promise<void> {
    const pool = this.pool;
    this.pool = null;
    await pool?.close();
  }

  /**
   * Stops everything that holds threads or database connections: the caches' listening lines,
   * the analysis threads and the terrain runtime. Call it before closing the database.
   */
  async close(): Promise<void> {
    this.sessions?.stop();
    this.sessions = null;
    this.answers?.stop();
    this.answers = null;
    this.built?.clear();
    this.built = null;
    this.basemapReader = null;
    await this.closeAnalysisPool();
    await this.closeTerrain();
  }

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
