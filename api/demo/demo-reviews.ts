import { and, isNotNull } from 'drizzle-orm';
import type { AppDeps } from '../app-deps';
import { ensureNetworkSettings } from '../board/network-settings';
import { scenarios } from '../db/schema/index';
import { syncReviewItems } from '../reviews/review-sync';
import { readScenarioResult } from '../scenarios/scenarios-repository';

/**
 * The board's placeholder factors, and the review items of the demo's computed scenarios. New
 * scenarios raise their items as they are computed; syncing again here also covers a database
 * seeded before descent review existed, and changes nothing (no e-mail) when all is in step.
 */
export async function seedDemoReviews(deps: AppDeps): Promise<void> {
  await ensureNetworkSettings(deps.db);
  const seeded = await deps.db
    .select()
    .from(scenarios)
    .where(and(isNotNull(scenarios.seedKey), isNotNull(scenarios.directionResults), isNotNull(scenarios.computedAt)));
  for (const scenario of seeded) {
    const stored = readScenarioResult(scenario);
    if (!stored) continue;
    await deps.db.transaction((tx) =>
      syncReviewItems(
        tx,
        scenario,
        { computedAt: scenario.computedAt!, directions: stored.directions },
        { publicUrl: deps.config.PUBLIC_URL },
      ),
    );
  }
}
