import { and, desc, eq, inArray, isNull, lt, notExists, sql } from 'drizzle-orm';
import type { BatchRun } from '@shared/domain/board-summary';
import type { Executor } from '../db/client';
import { batchRunItems, batchRuns, type BatchRunItemRow, type BatchRunRow } from '../db/schema/index';

export async function insertBatchRun(
  db: Executor,
  startedBy: { id: string | null; name: string },
  scenarioList: Array<{ id: string; name: string }>,
  reason: string | null = null,
): Promise<{ run: BatchRunRow; items: BatchRunItemRow[] }> {
  const [run] = await db.insert(batchRuns).values({ startedById: startedBy.id, startedByName: startedBy.name, reason }).returning();
  const items = await db
    .insert(batchRunItems)
    .values(scenarioList.map((scenario) => ({ batchRunId: run!.id, scenarioId: scenario.id, scenarioName: scenario.name })))
    .returning();
  return { run: run!, items };
}

const itemOf = (batchRunId: string, scenarioId: string) =>
  and(eq(batchRunItems.batchRunId, batchRunId), eq(batchRunItems.scenarioId, scenarioId));

/**
 * Claims a queued item for running under `claimToken`; undefined when another worker already
 * took or finished it (a job handed out twice runs once).
 */
export async function claimItem(db: Executor, batchRunId: string, scenarioId: string, claimToken: string) {
  const now = new Date();
  const [row] = await db
    .update(batchRunItems)
    .set({ status: 'running', startedAt: now, heartbeatAt: now, claimToken, error: null })
    .where(and(itemOf(batchRunId, scenarioId), eq(batchRunItems.status, 'queued')))
    .returning();
  return row;
}

/** Renews the heartbeat of an item this worker still holds. */
export async function beatItem(db: Executor, batchRunId: string, scenarioId: string, claimToken: string) {
  await db
    .update(batchRunItems)
    .set({ heartbeatAt: new Date() })
    .where(and(itemOf(batchRunId, scenarioId), eq(batchRunItems.claimToken, claimToken), eq(batchRunItems.status, 'running')));
}

/** Records the outcome; false when the claim was lost (the item was queued again and taken by another). */
export async function finishItem(
  db: Executor,
  batchRunId: string,
  scenarioId: string,
  claimToken: string,
  outcome: { error: string | null },
) {
  const finished = await db
    .update(batchRunItems)
    .set({
      status: outcome.error === null ? 'done' : 'failed',
      error: outcome.error,
      finishedAt: new Date(),
      claimToken: null,
      heartbeatAt: null,
    })
    .where(and(itemOf(batchRunId, scenarioId), eq(batchRunItems.claimToken, claimToken), eq(batchRunItems.status, 'running')))
    .returning({ id: batchRunItems.id });
  return finished.length === 1;
}

export async function setItemJob(db: Executor, batchRunId: string, scenarioId: string, jobId: string) {
  await db.update(batchRunItems).set({ jobId }).where(itemOf(batchRunId, scenarioId));
}

/**
 * Puts back in the queue every running item whose heartbeat stopped before `staleBefore` (its
 * worker died or hung); each row is taken by one sweeper only. Returns them with their old job.
 */
export async function releaseStaleItems(db: Executor, staleBefore: Date) {
  return db
    .update(batchRunItems)
    .set({ status: 'queued', claimToken: null, heartbeatAt: null, startedAt: null })
    .where(and(eq(batchRunItems.status, 'running'), lt(batchRunItems.heartbeatAt, staleBefore)))
    .returning({ batchRunId: batchRunItems.batchRunId, scenarioId: batchRunItems.scenarioId, jobId: batchRunItems.jobId });
}

/** Queued items (of runs not yet finished) with the job that should run them. */
export async function listQueuedItems(db: Executor) {
  return db
    .select({ batchRunId: batchRunItems.batchRunId, scenarioId: batchRunItems.scenarioId, jobId: batchRunItems.jobId })
    .from(batchRunItems)
    .innerJoin(batchRuns, eq(batchRuns.id, batchRunItems.batchRunId))
    .where(and(eq(batchRunItems.status, 'queued'), isNull(batchRuns.finishedAt)));
}

/** Swaps an item's job for a new one only if it is still `expected` (one sweeper re-sends it). */
export async function replaceItemJob(db: Executor, batchRunId: string, scenarioId: string, expected: string | null, jobId: string) {
  const replaced = await db
    .update(batchRunItems)
    .set({ jobId })
    .where(and(itemOf(batchRunId, scenarioId), expected === null ? isNull(batchRunItems.jobId) : eq(batchRunItems.jobId, expected)))
    .returning({ id: batchRunItems.id });
  return replaced.length === 1;
}

/**
 * Stamps the run finished once no item is queued or running. Run after the item's own update has
 * committed: of two workers finishing the last two items at once, the later one sees both.
 */
export async function finishRunIfComplete(db: Executor, batchRunId: string) {
  await db
    .update(batchRuns)
    .set({ finishedAt: new Date() })
    .where(
      and(
        eq(batchRuns.id, batchRunId),
        isNull(batchRuns.finishedAt),
        notExists(
          db
            .select({ one: sql`1` })
            .from(batchRunItems)
            .where(and(eq(batchRunItems.batchRunId, batchRunId), inArray(batchRunItems.status, ['queued', 'running']))),
        ),
      ),
    );
}

export async function findBatchRun(db: Executor, batchRunId: string) {
  const [run] = await db.select().from(batchRuns).where(eq(batchRuns.id, batchRunId));
  if (!run) return undefined;
  const items = await db.select().from(batchRunItems).where(eq(batchRunItems.batchRunId, batchRunId)).orderBy(batchRunItems.scenarioName);
  return { run, items };
}

export async function listBatchRuns(db: Executor, limit = 50) {
  const runs = await db.select().from(batchRuns).orderBy(desc(batchRuns.createdAt)).limit(limit);
  if (runs.length === 0) return [];
  const items = await db
    .select({ batchRunId: batchRunItems.batchRunId, status: batchRunItems.status })
    .from(batchRunItems)
    .where(
      inArray(
        batchRunItems.batchRunId,
        runs.map((run) => run.id),
      ),
    );
  return runs.map((run) => ({ run, items: items.filter((item) => item.batchRunId === run.id) }));
}

/** Progress and overall status from the items: queued until one starts, done when none is left. */
export function toBatchRun(run: BatchRunRow, items: Array<Pick<BatchRunItemRow, 'status'> & Partial<BatchRunItemRow>>): BatchRun {
  const count = (status: BatchRunItemRow['status']) => items.filter((item) => item.status === status).length;
  const done = count('done');
  const failed = count('failed');
  const status = done + failed === items.length ? 'done' : count('queued') === items.length ? 'queued' : 'running';
  return {
    id: run.id,
    status,
    total: items.length,
    done,
    failed,
    startedBy: run.startedByName,
    reason: run.reason ?? null,
    createdAt: run.createdAt.toISOString(),
    finishedAt: run.finishedAt?.toISOString() ?? null,
    items: items.map((item) => ({
      scenarioId: item.scenarioId!,
      scenarioName: item.scenarioName!,
      status: item.status,
      error: item.error ?? null,
    })),
  };
}
