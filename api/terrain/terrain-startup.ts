import type { AppDeps } from '../app-deps';
import { attachJobQueue } from '../app-runtime';
import { startJobQueue } from '../jobs/job-queue';
import { closeTerrainRuntime } from './terrain-runtime';
import { recoverTerrain, registerTerrainWorkers } from './terrain-service';

/**
 * Starts terrain for a server process: the shared job queue (pg-boss), and when this process
 * runs workers, the ingestion worker plus the start-up recovery (orphan files removed, models
 * stuck in "processing" queued again). Returns the matching stop.
 */
export async function startTerrain(deps: AppDeps): Promise<() => Promise<void>> {
  const queue = await startJobQueue(deps.config.DATABASE_URL);
  attachJobQueue(deps, queue);
  if (deps.config.RUN_WORKERS) {
    await registerTerrainWorkers(deps, queue);
    const recovered = await recoverTerrain(deps);
    if (recovered.removed.length || recovered.requeued.length || recovered.failed.length) {
      console.log(
        `[terrain] start-up recovery: removed ${recovered.removed.length} orphan file(s), re-queued ${recovered.requeued.length}, failed ${recovered.failed.length}`,
      );
    }
  }
  return async () => {
    await queue.stop();
    await closeTerrainRuntime(deps);
  };
}
