import type { BatchRun } from '@shared/domain/board-summary';

/** Plain words for a batch run's and a scenario's status. */
export const BATCH_STATUS_LABELS: Readonly<Record<BatchRun['items'][number]['status'], string>> = {
  queued: 'Waiting',
  running: 'Running',
  done: 'Done',
  failed: 'Failed',
};

/** A whole run: "done" there means every scenario has finished, failed ones included. */
export const RUN_STATUS_LABELS: Readonly<Record<BatchRun['status'], string>> = {
  queued: 'Waiting to start',
  running: 'Running',
  done: 'Finished',
};

export const BATCH_STATUS_ICONS: Readonly<Record<BatchRun['items'][number]['status'], string>> = {
  queued: 'schedule',
  running: 'autorenew',
  done: 'check_circle',
  failed: 'error',
};

/** Finished share of a run, 0–100 (failed scenarios count as finished). */
export function batchProgressPercent(run: { total: number; done: number; failed: number }): number {
  if (run.total <= 0) return 100;
  return Math.min(100, Math.round(((run.done + run.failed) / run.total) * 100));
}
