import type { BatchRun } from '@shared/domain/board-summary';

/** How often a running batch is asked for its progress (the issue asks for every 1–2 s). */
export const BATCH_POLL_INTERVAL_MS = 1_500;

export interface BatchRunPoller {
  /** Stops asking (page left, or another run opened). Safe to call more than once. */
  stop(): void;
}

/**
 * Asks for a batch run's progress every `intervalMs` until it is done, handing each answer to
 * `update`. One request at a time: the next waits until the previous has answered. A failed
 * request does not end the polling (the next tick tries again); `failed` hears about it.
 */
export function pollBatchRun(
  fetchRun: () => Promise<BatchRun>,
  update: (run: BatchRun) => void,
  options: { intervalMs?: number; failed?: (error: unknown) => void } = {},
): BatchRunPoller {
  const intervalMs = options.intervalMs ?? BATCH_POLL_INTERVAL_MS;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let stopped = false;

  const tick = async () => {
    timer = null;
    try {
      const run = await fetchRun();
      if (stopped) return;
      update(run);
      if (run.status === 'done') {
        stopped = true;
        return;
      }
    } catch (error: unknown) {
      // Expected now and then (a dropped connection, a restarting server): try again next tick.
      if (stopped) return;
      options.failed?.(error);
    }
    timer = setTimeout(() => void tick(), intervalMs);
  };

  timer = setTimeout(() => void tick(), intervalMs);
  return {
    stop() {
      stopped = true;
      if (timer !== null) clearTimeout(timer);
      timer = null;
    },
  };
}
