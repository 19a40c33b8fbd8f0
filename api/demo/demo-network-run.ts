import { and, asc, eq, isNotNull } from 'drizzle-orm';
import type { AppDeps } from '../app-deps';
import { batchRunItems, batchRuns, scenarios, users } from '../db/schema/index';
import { seededUuid } from '../vehicle-profiles/vehicle-presets-seed';

/**
 * The demo's record of one finished network-wide run: the in-service scenarios the seed computed,
 * each done at the time it was computed, started by the demo analyst. The network runs screen
 * then shows a finished run with its items on a fresh start, as it would after an analyst's run.
 * Idempotent (a fixed id): a second start leaves one copy.
 */
export async function seedDemoNetworkRun(deps: AppDeps): Promise<void> {
  const id = seededUuid('demo-batch-run:first');
  const [existing] = await deps.db.select({ id: batchRuns.id }).from(batchRuns).where(eq(batchRuns.id, id));
  if (existing) return;
  const computed = await deps.db
    .select({ id: scenarios.id, name: scenarios.name, computedAt: scenarios.computedAt })
    .from(scenarios)
    .where(and(eq(scenarios.inService, true), isNotNull(scenarios.computedAt)))
    .orderBy(asc(scenarios.name));
  if (computed.length === 0) return;
  const [analyst] = await deps.db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(eq(users.email, 'analyst@descentry.example'));
  const times = computed.map((scenario) => scenario.computedAt!.getTime());
  await deps.db.transaction(async (tx) => {
    await tx.insert(batchRuns).values({
      id,
      startedById: analyst?.id ?? null,
      startedByName: analyst?.name ?? 'Demo seed',
      createdAt: new Date(Math.min(...times)),
      finishedAt: new Date(Math.max(...times)),
    });
    await tx.insert(batchRunItems).values(
      computed.map((scenario) => ({
        batchRunId: id,
        scenarioId: scenario.id,
        scenarioName: scenario.name,
        status: 'done' as const,
        startedAt: scenario.computedAt,
        finishedAt: scenario.computedAt,
      })),
    );
  });
}
