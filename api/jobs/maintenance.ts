/**
 * Periodic upkeep of a worker process, run once at start-up and then every minute, so that what
 * a crash, a kill or a hung process left half-done is picked up again without anyone noticing:
 *
 * - network-run items whose worker stopped beating are queued again (batch-runs-service);
 * - terrain models whose ingestion stopped are queued again, their dead job cancelled
 *   (terrain-service);
 * - scenarios left "running" by a process that died are marked failed with the reason;
 * - sign-in and reset counters idle for a day are removed;
 * - what was deleted more than 30 days ago is removed for good (api/deleted-items).
 *
 * Every step is safe with several processes sweeping at once (each row is taken by one).
 */
import type { AppDeps } from '../app-deps';
import { purgeIdleThrottles } from '../auth/attempt-throttle';
import { requeueStaleBatchItems } from '../batch-runs/batch-runs-service';
import { purgeExpiredDeletes } from '../deleted-items/deleted-items-service';
import { failInterruptedRuns } from '../scenarios/scenarios-repository';
import { requeueStaleIngestion } from '../terrain/terrain-service';
import { requeueStalledServiceDayRuns } from '../service-days/service-days-service';

/** A scenario run takes seconds (one analysis is bounded); after this long "running" means lost, ms. */
const SCENARIO_RUN_STALE_MS = 5 * 60_000;
export const MAINTENANCE_INTERVAL_MS = 60_000;

export interface MaintenanceReport {
  batchItemsRequeued: number;
  ingestionRequeued: number;
  ingestionFailed: number;
  scenarioRunsFailed: number;
  serviceDayRunsRequeued: number;
  deletedItemsPurged: number;
}

export async function runMaintenance(deps: AppDeps, now = new Date()): Promise<MaintenanceReport> {
  const batchItemsRequeued = await requeueStaleBatchItems(deps, now);
  const ingestion = await requeueStaleIngestion(deps, now);
  const scenarioRunsFailed = await failInterruptedRuns(deps.db, new Date(now.getTime() - SCENARIO_RUN_STALE_MS));
  const serviceDayRunsRequeued = await requeueStalledServiceDayRuns(deps, now);
  await purgeIdleThrottles(deps.db);
  const deletedItemsPurged = await purgeExpiredDeletes(deps, now);
  return {
    batchItemsRequeued,
    ingestionRequeued: ingestion.requeued.length,
    ingestionFailed: ingestion.failed.length,
    scenarioRunsFailed,
    serviceDayRunsRequeued,
    deletedItemsPurged,
  };
}

/** Runs the sweep now and every minute until stopped; a failed sweep (database away) is logged and retried. */
export function startMaintenance(deps: AppDeps, intervalMs = MAINTENANCE_INTERVAL_MS): () => Promise<void> {
  let stopped = false;
  let running: Promise<void> = Promise.resolve();
  let timer: NodeJS.Timeout | undefined;
  const sweep = () => {
    running = runMaintenance(deps)
      .then((report) => {
        const total =
          report.batchItemsRequeued +
          report.ingestionRequeued +
          report.ingestionFailed +
          report.scenarioRunsFailed +
          report.serviceDayRunsRequeued +
          report.deletedItemsPurged;
        if (total > 0) {
          console.log(
            `[maintenance] re-queued ${report.batchItemsRequeued} network-run item(s) and ${report.ingestionRequeued} terrain ingestion(s); ` +
              `failed ${report.ingestionFailed} ingestion(s) without a file and ${report.scenarioRunsFailed} interrupted scenario run(s); ` +
              `re-queued ${report.serviceDayRunsRequeued} stalled service-day run(s); ` +
              `removed ${report.deletedItemsPurged} deleted item(s) for good`,
          );
        }
      })
      .catch((error: unknown) => console.error('[maintenance] sweep failed:', error instanceof Error ? error.message : error))
      .finally(() => {
        if (!stopped) timer = setTimeout(sweep, intervalMs);
      });
  };
  sweep();
  return async () => {
    stopped = true;
    clearTimeout(timer);
    await running;
  };
}
