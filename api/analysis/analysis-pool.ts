import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { PreviewRequestInput, PreviewResponse, ProfileView } from '@shared/domain/analysis';
import type { ElevationSampler } from '@shared/engine/analyse-route';
import { EngineInputError, MissingElevationError, RouteTooLargeError, UncoveredTerrainError } from '@shared/engine/validation';
import { HttpError } from '../http/http-error';
import type { ServiceDayEngineInput, ServiceDayEngineResult } from '@shared/engine/service-day';
import type {
  AnalysisTask,
  AnalysisTaskResult,
  ElevationAnswer,
  ElevationQuestion,
  EngineRefusal,
  ServiceDayTask,
  ServiceDayTaskResult,
} from './analysis-task';

/** Runs one analysis and answers the engine's response (the engine's errors are thrown as they are). */
export type RouteAnalyser = (request: PreviewRequestInput) => Promise<PreviewResponse>;

export interface AnalysisPoolOptions {
  /** Worker threads running analyses. */
  threads: number;
  /** Analyses waiting for a thread before more are refused with 503. */
  maxQueue: number;
  /** Heap of one worker thread, MiB: an analysis past it ends that worker, not the API. */
  workerHeapMb: number;
}

/**
 * Route analyses on worker threads (piscina), so the API thread stays free to answer while the
 * engine works: a 20 km preview at 1 m spacing costs the event loop only the hand-over. Elevations
 * are still sampled on the API thread, which owns the terrain cache, on the worker's request.
 */
export class AnalysisPool {
  private poolInstance: Piscina | null = null;
  private runningTasks = 0;

  constructor(private readonly options: AnalysisPoolOptions) {}

  /** Threads start on first use: a process that never analyses never starts them. */
  private get pool(): Piscina {
    this.poolInstance ??= new Piscina({
      filename: analysisWorkerPath(),
      minThreads: 0,
      maxThreads: this.options.threads,
      maxQueue: this.options.maxQueue,
      // Idle workers exit so a quiet API holds no engine memory.
      idleTimeout: 60_000,
      resourceLimits: { maxOldGenerationSizeMb: this.options.workerHeapMb },
    });
    return this.poolInstance;
  }

  /** The engine's response as an object (stored scenario results). */
  async analyse(request: PreviewRequestInput, sampleElevations?: ElevationSampler): Promise<PreviewResponse> {
    return (await this.run(request, sampleElevations, false)) as PreviewResponse;
  }

  /**
   * The engine's response already serialised as UTF-8 JSON by the worker (previews answered as
   * they are), its profile thinned there first when the client asked for a `profileView`.
   */
  async analyseToJson(request: PreviewRequestInput, sampleElevations?: ElevationSampler, profileView?: ProfileView): Promise<Buffer> {
    const bytes = (await this.run(request, sampleElevations, true, profileView)) as Uint8Array;
    return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  }

  /** Runs a whole service day on a worker thread; an engine refusal is raised again as its error class. */
  async runServiceDay(input: ServiceDayEngineInput): Promise<ServiceDayEngineResult> {
    const pool = this.pool;
    if (pool.queueSize >= this.options.maxQueue) throw busyError();
    this.runningTasks++;
    let result: ServiceDayTaskResult;
    try {
      result = (await pool.run({ serviceDay: input } satisfies ServiceDayTask)) as ServiceDayTaskResult;
    } catch (error) {
      if (isQueueFull(error)) throw busyError();
      throw error;
    } finally {
      this.runningTasks--;
    }
    if (!result.ok) throw reviveRefusal(result.refusal);
    return result.result;
  }

  /** Analyses handed to the pool and not yet settled (running or queued). */
  get running(): number {
    return this.runningTasks;
  }

  async close(): Promise<void> {
    const pool = this.poolInstance;
    this.poolInstance = null;
    await pool?.destroy();
  }

  private async run(
    request: PreviewRequestInput,
    sampleElevations: ElevationSampler | undefined,
    asJson: boolean,
    profileView?: ProfileView,
  ): Promise<PreviewResponse | Uint8Array> {
    const pool = this.pool;
    if (pool.queueSize >= this.options.maxQueue) throw busyError();
    let samplerFailure: unknown;
    const channel = sampleElevations ? new MessageChannel() : undefined;
    channel?.port1.on('message', (question: ElevationQuestion) => {
      void answerElevations(question, sampleElevations!).then(
        (elevationsM) =>
          channel.port1.postMessage({ ok: true, elevationsM } satisfies ElevationAnswer, [elevationsM.buffer as ArrayBuffer]),
        (error: unknown) => {
          samplerFailure = error;
          channel.port1.postMessage({
            ok: false,
            message: error instanceof Error ? error.message : String(error),
          } satisfies ElevationAnswer);
        },
      );
    });
    const task: AnalysisTask = {
      request,
      asJson,
      ...(profileView ? { profileView } : {}),
      ...(channel ? { elevationPort: channel.port2 } : {}),
    };
    let result: AnalysisTaskResult;
    this.runningTasks++;
    try {
      result = (await pool.run(task, { transferList: channel ? [channel.port2] : [] })) as AnalysisTaskResult;
    } catch (error) {
      // The sampler's own error (a terrain model that vanished, the database) is the real cause;
      // a full queue is "busy"; anything else is a fault of the run.
      if (samplerFailure) throw samplerFailure;
      if (isQueueFull(error)) throw busyError();
      throw error;
    } finally {
      this.runningTasks--;
      channel?.port1.close();
    }
    if (result instanceof Uint8Array) return result;
    if (!result.ok) throw reviveRefusal(result.refusal);
    return result.response;
  }
}

/** Retry-After for a full queue, s: about the time a queue of long analyses takes to move. */
const BUSY_RETRY_AFTER_S = 5;

function busyError(): HttpError {
  return new HttpError(
    503,
    'analysis_busy',
    'Every analysis thread is busy and the queue is full; try again in a few seconds',
    { retryAfterS: BUSY_RETRY_AFTER_S },
    { 'Retry-After': String(BUSY_RETRY_AFTER_S) },
  );
}

function isQueueFull(error: unknown): boolean {
  return error instanceof Error && /queue is at limit/i.test(error.message);
}

async function answerElevations(question: ElevationQuestion, sample: ElevationSampler): Promise<Float64Array> {
  const points: [number, number][] = [];
  for (let i = 0; i < question.lonLat.length; i += 2) points.push([question.lonLat[i]!, question.lonLat[i + 1]!]);
  const values = await sample(points);
  return Float64Array.from(values, (z) => (typeof z === 'number' ? z : Number.NaN));
}

/** The engine error the worker described, as the same class (callers tell refusals apart by class). */
export function reviveRefusal(refusal: EngineRefusal): EngineInputError {
  if (refusal.kind === 'too-large') {
    return new RouteTooLargeError(refusal.lengthM, refusal.pointCount, refusal.spacingM, refusal.maxLengthM, refusal.maxPoints);
  }
  if (refusal.kind === 'missing-elevation') return new MissingElevationError();
  const error = new EngineInputError(refusal.field, '');
  error.message = refusal.message;
  if (refusal.kind === 'uncovered') {
    Object.setPrototypeOf(error, UncoveredTerrainError.prototype);
    error.name = 'UncoveredTerrainError';
    Object.assign(error, { stretches: refusal.stretches });
  }
  return error;
}

/**
 * The bundled server (dist/api/main.mjs) finds its own bundled worker beside it; from the sources
 * the worker shim beside this module loads the TypeScript task through tsx.
 */
function analysisWorkerPath(): string {
  const besideModule = fileURLToPath(new URL('./analysis-worker.mjs', import.meta.url));
  if (existsSync(besideModule)) return besideModule;
  return join(process.cwd(), 'api', 'analysis', 'analysis-worker.mjs');
}

/** The configuration an analysis pool is built from (`AppRuntime.analysisPool`). */
export interface AnalysisPoolConfig {
  ANALYSIS_THREADS: number;
  ANALYSIS_MAX_QUEUE: number;
  ANALYSIS_WORKER_HEAP_MB: number;
}

/** The pool's options from the process's configuration. */
export function analysisPoolOptions(config: AnalysisPoolConfig): ConstructorParameters<typeof AnalysisPool>[0] {
  return { threads: config.ANALYSIS_THREADS, maxQueue: config.ANALYSIS_MAX_QUEUE, workerHeapMb: config.ANALYSIS_WORKER_HEAP_MB };
}
