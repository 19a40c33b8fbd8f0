import { afterAll, describe, expect, it } from 'vitest';
import type { AppDeps } from '../../api/app-deps';
import { attachJobQueue, jobQueueOf, runtimeOf } from '../../api/app-runtime';
import { withDefaultServices } from '../../api/app-services';
import { createInlineJobQueue, type JobPolicy, type JobQueue } from '../../api/jobs/job-queue';
import { terrainRuntimeFor } from '../../api/terrain/terrain-runtime';
import { createTestContext, testConfig } from '../support/test-app';

const COUNT_POLICY: JobPolicy = { retryLimit: 0, expireInSeconds: 60 };

/** Dependencies as a test or a tool builds them by hand (no database is reached here). */
function handBuiltDeps(): AppDeps {
  return { db: {} as AppDeps['db'], config: testConfig() };
}

describe('AppRuntime in AppDeps', () => {
  it('is made once on the caller’s dependencies and shared by every copy withDefaultServices makes', () => {
    const deps = handBuiltDeps();
    const filled = withDefaultServices(deps);
    const copy = { ...filled, sampleElevations: undefined };

    expect(deps.runtime).toBeDefined();
    expect(filled.runtime).toBe(deps.runtime);
    expect(runtimeOf(copy)).toBe(deps.runtime);
    expect(terrainRuntimeFor(copy)).toBe(terrainRuntimeFor(deps));
    expect(runtimeOf(handBuiltDeps())).not.toBe(deps.runtime);
  });

  it('answers the attached queue to every feature once one is attached, seen from every copy', async () => {
    const deps = handBuiltDeps();
    const copy = withDefaultServices(deps);
    const shared: JobQueue = createInlineJobQueue();
    attachJobQueue(deps, shared);
    let registered = 0;

    expect(jobQueueOf(copy)).toBe(shared);
    expect(await runtimeOf(copy).jobsFor('terrain', async () => void registered++)).toBe(shared);
    expect(registered).toBe(0);
  });

  it('without one, gives each feature its own in-process queue, registering its workers once', async () => {
    const runtime = runtimeOf(handBuiltDeps());
    const handled: string[] = [];
    let registrations = 0;
    const register = async (queue: JobQueue) => {
      registrations++;
      await queue.registerWorker<{ n: number }>(
        'count',
        async ({ n }) => {
          await new Promise((resolve) => setTimeout(resolve, 20));
          handled.push(`count ${n}`);
        },
        COUNT_POLICY,
      );
    };

    const [first, second] = await Promise.all([runtime.jobsFor('batch-runs', register), runtime.jobsFor('batch-runs', register)]);
    const other = await runtime.jobsFor('calibrations', async () => undefined);
    await first.send('count', { n: 1 }, COUNT_POLICY);
    await second.send('count', { n: 2 }, COUNT_POLICY);
    await runtime.inlineJobsIdle('batch-runs');

    expect(first).toBe(second);
    expect(other).not.toBe(first);
    expect(registrations).toBe(1);
    expect(handled.sort()).toEqual(['count 1', 'count 2']);
  });
});

describe('AppRuntime lifecycle', () => {
  const context = createTestContext();
  const other = createTestContext();
  afterAll(async () => {
    await context.close();
    await other.close();
  });

  it('keeps one session cache, answer cache, analysis pool and base-map reader per runtime, shared by every copy', () => {
    const runtime = runtimeOf(context.deps);
    const copy = withDefaultServices({ ...context.deps });

    expect(runtimeOf(copy).sessionCache).toBe(runtime.sessionCache);
    expect(runtimeOf(copy).answerCache).toBe(runtime.answerCache);
    expect(runtimeOf(copy).analysisPool).toBe(runtime.analysisPool);
    expect(runtimeOf(copy).basemapStorage).toBe(runtime.basemapStorage);
    expect(runtimeOf(copy).activeBasemap).toBe(runtime.activeBasemap);
    // Another test context is another process: nothing of the first is shared with it.
    expect(runtimeOf(other.deps).sessionCache).not.toBe(runtime.sessionCache);
    expect(runtimeOf(other.deps).answerCache).not.toBe(runtime.answerCache);
    expect(runtimeOf(other.deps).analysisPool).not.toBe(runtime.analysisPool);
  });

  it('stops the caches’ announcement lines on close, and makes fresh parts when used again', async () => {
    const runtime = runtimeOf(other.deps);
    const sessions = runtime.sessionCache;
    const answers = runtime.answerCache;
    const pool = runtime.analysisPool;
    for (let waited = 0; !(sessions.trusted && answers.trusted); waited += 50) {
      if (waited > 20_000) throw new Error('the caches never heard their own heartbeat');
      await new Promise((resolve) => setTimeout(resolve, 50));
    }

    await runtime.close();

    expect(sessions.trusted).toBe(false);
    expect(answers.trusted).toBe(false);
    expect(runtime.sessionCache).not.toBe(sessions);
    expect(runtime.answerCache).not.toBe(answers);
    expect(runtime.analysisPool).not.toBe(pool);
  });
});
