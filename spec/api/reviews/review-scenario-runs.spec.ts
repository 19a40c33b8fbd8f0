import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import type { ScenarioDraftInput } from '@shared/domain/scenarios';
import { reviewListSchema } from '@shared/domain/reviews';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { aRouteDraft, eastwardLine } from '../../support/road-route-builders';
import { sessionCookies } from '../../support/session-cookie';
import { createTestContext } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';

/**
 * Review items through real scenario runs: a 6 km descent falling 480 m (8 %) with a loaded
 * 12 m battery bus starting nearly full, so regeneration has no room and the friction brakes heat
 * up ("high" risk in the engine); starting at 50 % lets regeneration take the whole descent.
 */
const context = createTestContext();
const { app, db } = context;
const BUS = presetProfileId('battery-bus-12m');
let cookieFor: ReturnType<typeof sessionCookies>;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
});
afterAll(() => context.close());

describe('review items from scenario runs', () => {
  it('raises a high-risk item when a planner saves the scenario, and queues the safety e-mail with it', async () => {
    await cookieFor('safety');

    const scenario = await aSavedScenario();

    const items = await reviews();
    expect(items).toHaveLength(1);
    // The risk is the worst credible case's: with regeneration lost the descent is critical.
    expect(items[0]).toMatchObject({
      scenarioId: scenario.id,
      risk: 'critical',
      state: 'raised',
      direction: 'outbound',
      routeName: 'Summit descent',
    });
    expect(await countRows(db, 'mail_outbox')).toBe(1);
  });

  it('keeps the same item when the scenario is re-run unchanged', async () => {
    const scenario = await aSavedScenario();
    const [before] = await reviews();

    const rerun = await request(app)
      .post(`/api/scenarios/${scenario.id}/run`)
      .set('Cookie', await cookieFor('planner'));

    expect(rerun.status).toBeLessThan(300);
    const after = await reviews();
    expect(after).toHaveLength(1);
    expect(after[0]!.id).toBe(before!.id);
  });

  it('re-runs with the mitigation, records the risk before and after, and leaves the planner’s scenario as it was', async () => {
    const scenario = await aSavedScenario({}, SHORT_DESCENT);
    const [item] = await reviews();
    const safety = await cookieFor('safety');
    await request(app).post(`/api/reviews/${item!.id}/transitions`).set('Cookie', safety).send({ action: 'acknowledge' });

    const response = await request(app)
      .post(`/api/reviews/${item!.id}/transitions`)
      .set('Cookie', safety)
      .send({
        action: 'mitigate',
        mitigation: { descentSpeedCapKph: await worstCaseSpeedKph(scenario.id) },
        note: 'Signs at the worst-case speed on the summit run',
      });

    expect(response.status).toBe(200);
    expect(response.body.item.state).toBe('mitigated');
    expect(['high', 'critical']).toContain(response.body.item.risk);
    expect(['low', 'elevated']).toContain(response.body.item.mitigatedRisk);
    expect(response.body.event.details.riskBefore).toBe(response.body.item.risk);
    expect(response.body.event.details.mitigatedPeakBrakeTempC).toBeLessThan(response.body.event.details.previousPeakBrakeTempC);
    const stored = await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', safety);
    expect(stored.body).toMatchObject({ startSoc: 0.95, riskCounts: { high: 1 } });
  });

  it('refuses an SOC ceiling alone: the worst case has no regeneration, so the charge at the top cannot help', async () => {
    await aSavedScenario();
    const [item] = await reviews();
    const safety = await cookieFor('safety');
    await request(app).post(`/api/reviews/${item!.id}/transitions`).set('Cookie', safety).send({ action: 'acknowledge' });

    const response = await request(app)
      .post(`/api/reviews/${item!.id}/transitions`)
      .set('Cookie', safety)
      .send({ action: 'mitigate', mitigation: { socCeiling: 0.5 } });

    expect(response.status).toBe(422);
    expect(response.body.error.details).toMatchObject({ riskBefore: 'critical', riskAfter: 'critical', belowElevated: false });
  });

  it('refuses with 422 a mitigation whose re-run stays high, returns the re-run’s figures and leaves the item in review', async () => {
    await aSavedScenario();
    const [item] = await reviews();
    const safety = await cookieFor('safety');
    await request(app).post(`/api/reviews/${item!.id}/transitions`).set('Cookie', safety).send({ action: 'acknowledge' });

    const response = await request(app)
      .post(`/api/reviews/${item!.id}/transitions`)
      .set('Cookie', safety)
      .send({ action: 'mitigate', mitigation: { descentSpeedCapKph: 120, mandatoryRetarder: true } });

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('mitigation_insufficient');
    expect(response.body.error.message).toMatch(/still gives critical risk/);
    expect(response.body.error.details).toMatchObject({ riskBefore: 'critical', riskAfter: 'critical', belowElevated: false });
    const [after] = await reviews();
    expect(after).toMatchObject({ state: 'in-review', mitigation: null, mitigatedRisk: null });
  });

  it('keeps a mitigated item closed on an unchanged rerun and reopens it when the planner makes the scenario harsher', async () => {
    const scenario = await aSavedScenario({ load: { kind: 'case', case: 'seated' } }, SHORT_DESCENT);
    const [item] = await reviews();
    const safety = await cookieFor('safety');
    const planner = await cookieFor('planner');
    await request(app).post(`/api/reviews/${item!.id}/transitions`).set('Cookie', safety).send({ action: 'acknowledge' });
    const mitigated = await request(app)
      .post(`/api/reviews/${item!.id}/transitions`)
      .set('Cookie', safety)
      .send({ action: 'mitigate', mitigation: { descentSpeedCapKph: await worstCaseSpeedKph(scenario.id) } });
    expect(mitigated.status).toBe(200);

    await request(app).post(`/api/scenarios/${scenario.id}/run`).set('Cookie', planner);
    const afterRerun = (await reviews())[0]!;
    const harsher = await request(app)
      .put(`/api/scenarios/${scenario.id}`)
      .set('Cookie', planner)
      .send(aDraft(scenario.routeId, { load: { kind: 'case', case: 'full-standing' }, startSoc: 1 }));

    expect(afterRerun.state).toBe('mitigated');
    expect(harsher.status).toBe(200);
    const reopened = (await reviews())[0]!;
    expect(reopened.id).toBe(item!.id);
    expect(reopened.state).toBe('reopened');
    expect(reopened.peakBrakeTempC).toBeGreaterThan(item!.peakBrakeTempC + 10);
  });
});

// Helpers

/**
 * A 3 km descent falling 240 m (8 %): with regeneration lost it still gets hot, but a lower
 * speed can hold it, so a speed cap can mitigate it (the 6 km summit descent is past any speed).
 */
const SHORT_DESCENT = { lengthM: 3_000, dropM: 240 };

async function aSavedScenario(
  overrides: Partial<ScenarioDraftInput> = {},
  line: { lengthM: number; dropM: number } = { lengthM: 6_000, dropM: 480 },
) {
  const planner = await cookieFor('planner');
  const route = await request(app)
    .post('/api/routes')
    .set('Cookie', planner)
    .send(aRouteDraft({ name: 'Summit descent', geometry: eastwardLine(line), stops: [], speedLimits: [] }));
  if (route.status !== 201) throw new Error(`route: ${route.status} ${route.text}`);
  const response = await request(app).post('/api/scenarios').set('Cookie', planner).send(aDraft(route.body.id, overrides));
  if (response.status !== 201) throw new Error(`scenario: ${response.status} ${response.text}`);
  return response.body as { id: string; routeId: string };
}

function aDraft(routeId: string, overrides: Partial<ScenarioDraftInput> = {}): ScenarioDraftInput {
  return {
    name: 'Summit run, winter',
    routeId,
    vehicleProfileId: BUS,
    load: { kind: 'case', case: 'full-standing' },
    season: { kind: 'season', season: 'winter' },
    startSoc: 0.95,
    ...overrides,
  };
}

/** The worst case's advised speed on the scenario's first descent (keeps the brakes under fade less the margin). */
async function worstCaseSpeedKph(scenarioId: string): Promise<number> {
  const result = await request(app)
    .get(`/api/scenarios/${scenarioId}/result`)
    .set('Cookie', await cookieFor('safety'));
  const speed = result.body.directions[0].descents[0].worstCase.maxSafeSpeedKph as number | null;
  if (speed === null) throw new Error('the summit descent has no worst-case speed advice');
  return Math.max(5, speed);
}

async function reviews() {
  const response = await request(app)
    .get('/api/reviews')
    .set('Cookie', await cookieFor('board'));
  return reviewListSchema.parse(response.body).items;
}
