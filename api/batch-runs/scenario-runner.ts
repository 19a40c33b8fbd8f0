import type { AppDeps } from '../app-deps';
import { rerunScenario } from '../scenarios/scenarios-service';

/** Re-runs one stored scenario and stores its result (review items follow); throws with a plain reason. */
export type BatchScenarioRunner = (deps: AppDeps, scenarioId: string) => Promise<void>;

/**
 * The scenario's own re-run (it stores the result, or records a failure reason on the
 * scenario); a failed run becomes this batch item's error.
 */
export const runScenarioForBatch: BatchScenarioRunner = async (deps, scenarioId) => {
  const scenario = await rerunScenario(deps, scenarioId);
  if (scenario.status === 'failed') throw new Error(scenario.failureReason ?? 'the run failed');
};
