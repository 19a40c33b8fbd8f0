import type { AppDeps } from '../app-deps';
import { jobQueueOf } from '../app-runtime';
import { recoverBasemaps, registerBasemapWorkers } from './basemap-service';
import { registerRoadGraphWorkers } from '../road-graph/road-graph-jobs';

/**
 * Base map for a server or worker process that works the shared queue (RUN_WORKERS): the
 * import and road-graph workers, then the start-up recovery. Needs the queue started by
 * startTerrain.
 */
export async function startBasemap(deps: AppDeps): Promise<void> {
  const queue = jobQueueOf(deps);
  if (!queue || !deps.config.RUN_WORKERS) return;
  await registerBasemapWorkers(deps, queue);
  await registerRoadGraphWorkers(deps, queue);
  const { requeued } = await recoverBasemaps(deps);
  if (requeued > 0) console.log(`[basemap] start-up recovery: re-queued ${requeued} import(s)`);
}
