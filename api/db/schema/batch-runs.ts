import { index, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { BATCH_ITEM_STATUSES } from '@shared/domain/board-summary';

/** A network-wide rerun of every in-service scenario; its progress is read from its items. */
export const batchRuns = pgTable('batch_runs', {
  id: uuid().primaryKey().defaultRandom(),
  startedById: uuid(),
  startedByName: text().notNull(),
  /** Why the run was started when not by hand, e.g. an accepted calibration of a vehicle profile. */
  reason: text(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  /** Set by the worker that finishes the last item. */
  finishedAt: timestamp({ withTimezone: true }),
});
export type BatchRunRow = typeof batchRuns.$inferSelect;

/**
 * One scenario of a batch run, run as one job of the shared queue. The scenario id is kept
 * without a foreign key (with its name) so a deleted scenario leaves the batch's record intact.
 */
export const batchRunItems = pgTable(
  'batch_run_items',
  {
    id: uuid().primaryKey().defaultRandom(),
    batchRunId: uuid()
      .notNull()
      .references(() => batchRuns.id, { onDelete: 'cascade' }),
    scenarioId: uuid().notNull(),
    scenarioName: text().notNull(),
    status: text({ enum: BATCH_ITEM_STATUSES }).notNull().default('queued'),
    error: text(),
    /** The queue's job for this item (the latest one when the item was queued again). */
    jobId: text(),
    /** Stamped by the worker that runs the item; only its holder records the outcome. */
    claimToken: uuid(),
    /** Renewed while the item runs; a running item whose heartbeat stops is queued again. */
    heartbeatAt: timestamp({ withTimezone: true }),
    startedAt: timestamp({ withTimezone: true }),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (table) => [
    uniqueIndex('batch_run_items_batch_scenario_key').on(table.batchRunId, table.scenarioId),
    index('batch_run_items_status_idx').on(table.batchRunId, table.status),
  ],
);
export type BatchRunItemRow = typeof batchRunItems.$inferSelect;
