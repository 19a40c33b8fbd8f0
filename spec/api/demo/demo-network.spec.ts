import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoNetwork } from '../../../api/demo/demo-network';
import { seedDemoPeople } from '../../../api/demo/demo-people';
import { createTestContext } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';

const context = createTestContext();
const { db, deps } = context;

beforeAll(async () => {
  await truncateAll(db);
  await seedDemoPeople(db);
});
afterAll(() => context.close());

describe('seedDemoNetwork', () => {
  it('loads routes, own vehicle profiles and computed scenarios, and a second run leaves one copy', async () => {
    await seedDemoNetwork(deps);
    const first = await counts();

    await seedDemoNetwork(deps);

    expect(await counts()).toEqual(first);
    expect(first).toEqual({ routes: 5, versions: 5, profiles: 8, scenarios: 8, network: 1 });
  });

  it('computes every scenario, marks several in service, and finds at least one high or critical descent', async () => {
    const rows = [
      ...(await db.execute<{
        name: string;
        status: string;
        in_service: boolean;
        high: number;
        critical: number;
        failure_reason: string | null;
      }>(
        sql`select name, status, in_service, (risk_counts->>'high')::int as high, (risk_counts->>'critical')::int as critical, failure_reason from scenarios`,
      )),
    ];

    expect(rows.filter((row) => row.status !== 'done')).toEqual([]);
    expect(rows.filter((row) => row.in_service).length).toBeGreaterThanOrEqual(4);
    expect(rows.some((row) => row.high + row.critical > 0)).toBe(true);
    const trips = [
      ...(await db.execute<{ n: number }>(sql`select count(*)::int as n from road_route_versions where trips_per_day > 0`)),
    ][0]!;
    expect(trips.n).toBe(5);
  });
});

// Helpers

async function counts() {
  return {
    routes: await countRows(db, 'road_routes'),
    versions: await countRows(db, 'road_route_versions'),
    profiles: await countRows(db, 'vehicle_profiles'),
    scenarios: await countRows(db, 'scenarios'),
    network: await countRows(db, 'road_network_lines'),
  };
}
