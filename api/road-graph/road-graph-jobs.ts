import { sql } from 'drizzle-orm';
import type { AppDeps } from '../app-deps';
import { runtimeOf } from '../app-runtime';
import { type JobPolicy, type JobQueue } from '../jobs/job-queue';
import { sampleEdgeElevations } from './road-graph-grades';

/** Re-samples the graph's elevations after the terrain changed (a model became ready or was deleted). */
export const ROAD_GRAPH_GRADES_JOB = 'road-graph-grades';

export async function regradeRoadGraph(deps: AppDeps): Promise<void> {
  const active = runtimeOf(deps).activeBasemap;
  active.forget();
  const base = await active.current();
  if (base) await sampleEdgeElevations(deps, { kind: 'imported', schemaName: base.schemaName });
  await sampleEdgeElevations(deps, { kind: 'overlay', baseImportId: base?.importId ?? null });
}

export async function registerRoadGraphWorkers(deps: AppDeps, queue: JobQueue): Promise<void> {
  await queue.registerWorker(ROAD_GRAPH_GRADES_JOB, () => regradeRoadGraph(deps), ROAD_GRAPH_GRADES_POLICY);
}

const ROAD_GRAPH_GRADES_POLICY: JobPolicy = { expireInSeconds: 60 * 60, retryLimit: 1 };

/** Queues a re-sampling of the graph's elevations when there is a graph (in-process where no shared queue runs). */
export async function requestRoadGraphRegrade(deps: AppDeps): Promise<void> {
  const active = runtimeOf(deps).activeBasemap;
  active.forget();
  const base = await active.current();
  const [overlay] = await deps.db.execute<{ found: boolean }>(sql`SELECT EXISTS (SELECT 1 FROM road_graph_overlay_edges) AS found`);
  if (!base && !overlay?.found) return;
  const queue = await runtimeOf(deps).jobsFor('road-graph', (inline) => registerRoadGraphWorkers(deps, inline));
  await queue.send(ROAD_GRAPH_GRADES_JOB, {}, ROAD_GRAPH_GRADES_POLICY);
}

/** Resolves when in-process re-gradings have finished (tests and the demo seed). */
export async function waitForInlineRoadGraphJobs(deps: AppDeps): Promise<void> {
  await runtimeOf(deps).inlineJobsIdle('road-graph');
}
