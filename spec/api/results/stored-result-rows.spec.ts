import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { reviewItems, scenarios } from '../../../api/db/schema/index';
import { syncReviewItems } from '../../../api/reviews/review-sync';
import { STORED_RESULT_VERSION } from '../../../api/results/stored-result';
import { aDescent, aDirectionResult, aRoute, aScenario, aVehicleProfile } from '../../support/scenario-fixtures';
import { createTestContext, signedInAgent } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;

beforeEach(() => truncateAll(db));
afterAll(() => context.close());

/** A descent as stored before results carried a version: no nominal risk. */
function anOldDescent() {
  const { nominalRisk: _nominalRisk, ...descent } = aDescent({ risk: 'high' });
  return descent;
}

describe('stored results in the old shape', () => {
  it('answers a version-1 scenario result upgraded to the current shape', async () => {
    const route = await aRoute(db);
    const profile = await aVehicleProfile(db);
    const scenario = await aScenario(db, {
      routeId: route.id,
      vehicleProfileId: profile.id,
      directionResults: [aDirectionResult('outbound', [anOldDescent()])],
    });
    const [stored] = await db
      .select({ version: scenarios.resultVersion, directions: scenarios.directionResults })
      .from(scenarios)
      .where(eq(scenarios.id, scenario.id));
    // The row really is in the old shape: version 1 from the migration's default, no nominal risk.
    expect(stored!.version).toBe(1);
    expect(stored!.directions![0]!.descents[0]!).not.toHaveProperty('nominalRisk');
    const { agent } = await signedInAgent(app, db, 'planner');

    const response = await agent.get(`/api/scenarios/${scenario.id}/result`);

    expect(response.status).toBe(200);
    expect(response.body.directions[0].descents[0]).toMatchObject({ risk: 'high', nominalRisk: 'high' });
  });

  it('reads a version-1 review item upgraded in the list and the detail', async () => {
    const route = await aRoute(db);
    const profile = await aVehicleProfile(db);
    const scenario = await aScenario(db, {
      routeId: route.id,
      vehicleProfileId: profile.id,
      directionResults: [aDirectionResult('outbound', [anOldDescent()])],
    });
    await db.transaction((tx) =>
      syncReviewItems(tx, scenario, { computedAt: new Date(), directions: [aDirectionResult('outbound', [anOldDescent()])] }),
    );
    const [written] = await db.select({ version: reviewItems.resultVersion }).from(reviewItems);
    expect(written!.version).toBe(STORED_RESULT_VERSION);
    // Put the item back into the old shape, as a row written before versioning holds it.
    await db.execute(sql`update review_items set result_version = 1, descent = descent - 'nominalRisk'`);
    const { agent } = await signedInAgent(app, db, 'safety');

    const list = await agent.get('/api/reviews');
    const detail = await agent.get(`/api/reviews/${list.body.items[0].id}`);

    expect(list.status).toBe(200);
    expect(detail.status).toBe(200);
    expect(detail.body.descent).toMatchObject({ risk: 'high', nominalRisk: 'high' });
  });
});
