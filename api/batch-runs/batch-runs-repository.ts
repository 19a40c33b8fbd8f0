import { and, desc, eq, inArray, isNull, notExists, sql } from 'drizzle-orm';
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

/** Claims a queued item for running; undefined when another worker already took or finished it. */
export async function claimItem(db: Executor, batchRunId: string, scenarioId: string) {
  const [row] = await db
    .update(batchRunItems)
    .set({ status: 'running', startedAt: new Date(), error: null })
    .where(and(eq(batchRunItems.batchRunId, batchRunId), eq(batchRunItems.scenarioId, scenarioId), eq(batchRunItems.status, 'queued')))
    .returning();
  return row;
}

export async function finishItem(db: Executor, batchRunId: string, scenarioId: string, outcome: { error: string | null }) {
  await db
    .update(batchRunItems)
    .set({ status: outcome.error === null ? 'done' : 'failed', error: outcome.error, finishedAt: new Date() })
    .where(and(eq(batchRunItems.batchRunId, batchRunId), eq(batchRunItems.scenarioId, scenarioId)));
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
    .where(inArray(batchRunItems.batchRunId, runs.map((run) => run.id)));
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
