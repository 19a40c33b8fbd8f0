import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { scenarioResultSchema, scenarioSchema, type ScenarioDraftInput } from '@shared/domain/scenarios';
import { ENGINE_VERSION, ENGINEERING_CAUTION } from '@shared/engine/constants';
import { sql } from 'drizzle-orm';
import { createApp } from '../../../api/app';
import { runtimeOf } from '../../../api/app-runtime';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';
import { aRouteDraft, eastwardLine } from '../../support/road-route-builders';
import { RAW_VALUE_PATTERNS, readPdfWords, wordsOutsideMargins } from '../../support/pdf-words';
import { ADVICE_CAUTIONS, ADVICE_CAUTIONS_TITLE, RISK_LABELS, formatSafeSpeed } from '@shared/presentation/index';
import { MARGIN_PT } from '../../../api/pdf/pdf-layout';
import { SUMMARY_FIGURES, formatFigure } from '@shared/presentation/figures';
import { profileCsvHeader } from '@shared/presentation/profile-columns';

const context = createTestContext();
const { app, db } = context;
const BUS = presetProfileId('battery-bus-12m');
let cookieFor: ReturnType<typeof sessionCookies>;
let planner: string;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
  planner = await cookieFor('planner');
});
afterAll(() => context.close());

describe('POST /api/scenarios', () => {
  it('saves and computes the scenario, storing the engine version and the exact inputs', async () => {
    const route = await aRoute();

    const response = await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id));

    expect(response.status).toBe(201);
    const scenario = scenarioSchema.parse(response.body);
    expect(scenario).toMatchObject({
      status: 'done',
      engineVersion: ENGINE_VERSION,
      isStale: false,
      routeVersion: 1,
      routeName: 'Spec line 1',
    });
    expect(scenario.summary!.lengthM).toBeCloseTo(2_000, 0);
    const result = scenarioResultSchema.parse((await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body);
    expect(result.caution).toBe(ENGINEERING_CAUTION);
    const inputs = result.inputs as {
      provenance: { routeVersion: number; engineVersion: string };
      directions: {
        request: {
          vehicle: { payloadKg: number; auxPowerW: number };
          conditions: { ambientC: number };
          options: { stops: { atM: number; dwellS: number }[]; speedLimitKph: unknown };
        };
      }[];
    };
    expect(inputs.provenance).toMatchObject({ routeVersion: 1, engineVersion: ENGINE_VERSION });
    const request0 = inputs.directions[0]!.request;
    // Full standing load of the 12 m bus preset, winter auxiliaries and ambient.
    expect(request0.vehicle.payloadKg).toBe(5_950);
    expect(request0.vehicle.auxPowerW).toBe(22_000);
    expect(request0.conditions.ambientC).toBe(-5);
    expect(request0.options.stops.map((stop) => Math.round(stop.atM))).toEqual([600, 1_400]);
    expect(request0.options.speedLimitKph).toEqual([
      { fromM: 0, toM: 500, speedKph: 30 },
      { fromM: 500, toM: expect.closeTo(2_000, 0), speedKph: 50 },
    ]);
  });

  it('answers the stored result with a thinned profile of only the asked series when a view is asked for', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    const full = (await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body;

    const response = await request(app).get(`/api/scenarios/${scenario.id}/result?profileStepM=100&series=speedMps`).set('Cookie', planner);

    expect(response.status).toBe(200);
    const profile = response.body.directions[0].profile as Record<string, number[]>;
    expect(Object.keys(profile).sort()).toEqual(['distanceM', 'speedMps']);
    expect(profile['distanceM']!.length).toBeLessThan(full.directions[0].profile.distanceM.length);
    // The fastest point stays in, rounded as the CSV export rounds it (0.01 km/h, i.e. 0.001 m/s).
    expect(Math.max(...profile['speedMps']!)).toBe(
      Math.round(Math.max(...(full.directions[0].profile.speedMps as number[])) * 1000) / 1000,
    );
    expect(response.body.summary).toEqual(full.summary);
    expect(Object.keys(full.directions[0].profile)).toContain('brakeTempC');
  });

  it('uses passengers × passenger mass when the load is a passenger count', async () => {
    const route = await aRoute();

    const response = await request(app)
      .post('/api/scenarios')
      .set('Cookie', await cookieFor('analyst'))
      .send(aScenarioDraft(route.id, { load: { kind: 'passengers', passengers: 40 } }));

    expect(response.status).toBe(201);
    const result = (await request(app).get(`/api/scenarios/${response.body.id}/result`).set('Cookie', planner)).body;
    expect(result.inputs.directions[0].request.vehicle.payloadKg).toBe(40 * 70);
  });

  it('answers 400 naming routeId for a route that does not exist, and writes nothing', async () => {
    const response = await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send(aScenarioDraft('00000000-0000-4000-8000-000000000000'));

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/routeId/);
    expect(await countRows(db, 'scenarios')).toBe(0);
  });

  it('answers 400 naming startSoc when it is above 1, and writes nothing', async () => {
    const route = await aRoute();

    const response = await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send(aScenarioDraft(route.id, { startSoc: 1.5 }));

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/startSoc/);
    expect(await countRows(db, 'scenarios')).toBe(0);
  });

  it('answers 403 to a safety officer', async () => {
    const route = await aRoute();

    const response = await request(app)
      .post('/api/scenarios')
      .set('Cookie', await cookieFor('safety'))
      .send(aScenarioDraft(route.id));

    expect(response.status).toBe(403);
  });

  it('records a failed run that names the stretches without terrain', async () => {
    const route = await aRoute({ geometry: eastwardLine({ lengthM: 6_000, withElevation: false }), stops: [], speedLimits: [] });
    // A sampler that covers everything but 3.2–4.5 km along the line.
    const sampled = createApp({
      ...context.deps,
      sampleElevations: async (points) =>
        points.map(([lon]) => {
          const alongM = (lon - 9.0) * 76_620;
          return alongM > 3_200 && alongM < 4_500 ? null : 1_000;
        }),
    });

    const response = await request(sampled).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id));

    expect(response.status).toBe(201);
    expect(response.body.status).toBe('failed');
    expect(response.body.failureReason).toMatch(/no terrain covers 3\.2–4\.5 km/);
    const result = await request(app).get(`/api/scenarios/${response.body.id}/result`).set('Cookie', planner);
    expect(result.status).toBe(404);
    expect(result.body.error.message).toMatch(/no terrain covers/);
  });

  it('records a failed run naming the stretches when the line has no elevations and no terrain covers it', async () => {
    const route = await aRoute({ geometry: eastwardLine({ withElevation: false }) });

    const response = await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id));

    expect(response.body.status).toBe('failed');
    expect(response.body.failureReason).toMatch(/no terrain covers 0\.0–2\.0 km/);
  });

  it('keeps the last good result beside the reason when a re-run fails', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    await request(app)
      .put(`/api/routes/${route.id}`)
      .set('Cookie', planner)
      .send(aRouteDraft({ geometry: eastwardLine({ withElevation: false }), stops: [] }));

    const rerun = await request(app).post(`/api/scenarios/${scenario.id}/run`).set('Cookie', planner);
    const result = await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner);

    expect(rerun.body.status).toBe('failed');
    expect(rerun.body.failureReason).toMatch(/no terrain covers/);
    expect(rerun.body.summary.lengthM).toBeCloseTo(scenario.summary.lengthM, 6);
    expect(result.status).toBe(200);
    expect(result.body.computedAt).toBe(scenario.computedAt);
  });
});

describe('revalidation of the stored result', () => {
  it('answers a repeat read with 304 until a re-run changes the result, then 200 with a new ETag', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    const resultPath = `/api/scenarios/${scenario.id}/result`;

    const first = await request(app).get(resultPath).set('Cookie', planner);
    const etag = first.headers['etag']!;
    const again = await request(app).get(resultPath).set('Cookie', planner).set('If-None-Match', etag);
    const thinned = await request(app).get(`${resultPath}?profileStepM=100`).set('Cookie', planner).set('If-None-Match', etag);
    const anonymous = await request(app).get(resultPath).set('If-None-Match', etag);
    const headline = await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', planner);
    await new Promise((resolve) => setTimeout(resolve, 5));
    const rerun = await request(app).post(`/api/scenarios/${scenario.id}/run`).set('Cookie', planner);
    const afterRun = await request(app).get(resultPath).set('Cookie', planner).set('If-None-Match', etag);
    const headlineAfterRun = await request(app)
      .get(`/api/scenarios/${scenario.id}`)
      .set('Cookie', planner)
      .set('If-None-Match', headline.headers['etag']!);

    expect(first.status).toBe(200);
    expect(first.headers['cache-control']).toBe('private, no-cache');
    expect(etag).toMatch(/^W\/"/);
    expect(again.status).toBe(304);
    expect(again.text).toBe('');
    // Another view of the same result is another answer.
    expect(thinned.status).toBe(200);
    expect(thinned.headers['etag']).not.toBe(etag);
    // The access check comes first: no 304 for someone signed out.
    expect(anonymous.status).toBe(401);
    expect(rerun.status).toBe(200);
    expect(afterRun.status).toBe(200);
    expect(afterRun.body.computedAt).toBe(rerun.body.computedAt);
    expect(afterRun.body.computedAt).not.toBe(first.body.computedAt);
    expect(afterRun.headers['etag']).not.toBe(etag);
    expect(headlineAfterRun.status).toBe(200);
    expect(headlineAfterRun.headers['etag']).not.toBe(headline.headers['etag']);
  });

  it('gives every role the same stored result and the same ETag (nothing in it depends on the role)', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    const resultPath = `/api/scenarios/${scenario.id}/result`;
    const planners = await request(app).get(resultPath).set('Cookie', planner);

    const boards = await request(app)
      .get(resultPath)
      .set('Cookie', await cookieFor('board'));
    const safetys = await request(app)
      .get(resultPath)
      .set('Cookie', await cookieFor('safety'))
      .set('If-None-Match', planners.headers['etag']!);

    expect(boards.status).toBe(200);
    expect(boards.body).toEqual(planners.body);
    expect(boards.headers['etag']).toBe(planners.headers['etag']);
    expect(safetys.status).toBe(304);
  });

  it('builds the result answer once per change: repeat visits cost a lookup, a change of the row by any means a new answer', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    const resultPath = `/api/scenarios/${scenario.id}/result?profileStepM=25&series=elevationM,brakeTempC`;
    const kept = runtimeOf(context.deps).builtAnswers;
    const before = { ...kept.stats };

    const first = await request(app).get(resultPath).set('Cookie', planner);
    const repeat = await request(app).get(resultPath).set('Cookie', planner).set('If-None-Match', first.headers['etag']!);
    const newVisit = await request(app).get(resultPath).set('Cookie', planner).set('Accept-Encoding', 'br');
    const afterVisits = { ...kept.stats };
    // A change no API write made (a script, a query by hand) is seen as well: the row's version changed.
    await db.execute(sql`update scenarios set summary = jsonb_set(summary, '{lengthM}', '1') where id = ${scenario.id}`);
    const afterChange = await request(app).get(resultPath).set('Cookie', planner).set('If-None-Match', first.headers['etag']!);

    expect(first.status).toBe(200);
    expect(Object.keys(first.body.directions[0].profile).sort()).toEqual(['brakeTempC', 'distanceM', 'elevationM']);
    expect(repeat.status).toBe(304);
    expect(newVisit.status).toBe(200);
    expect(newVisit.headers['content-encoding']).toBe('br');
    expect(newVisit.headers['etag']).toBe(first.headers['etag']);
    expect(newVisit.body).toEqual(first.body);
    expect(afterVisits.stored - before.stored).toBe(1);
    expect(afterVisits.hits - before.hits).toBe(1);
    expect(afterChange.status).toBe(200);
    expect(afterChange.headers['etag']).not.toBe(first.headers['etag']);
    expect(afterChange.body.summary.lengthM).toBe(1);
    expect(first.body.summary.lengthM).toBeGreaterThan(1);
  });

  it('sends the scenario anew when a safety setting makes it out of date, while the result, which does not show it, still holds', async () => {
    const admin = await cookieFor('admin');
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    const scenarioPath = `/api/scenarios/${scenario.id}`;
    const resultPath = `${scenarioPath}/result?profileStepM=25`;
    const headline = await request(app).get(scenarioPath).set('Cookie', planner);
    const result = await request(app).get(resultPath).set('Cookie', planner);
    const {
      isPlaceholder: _p,
      updatedAt: _u,
      updatedByName: _n,
      ...settings
    } = (await request(app).get('/api/settings/network').set('Cookie', admin)).body;

    const changed = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, fadeMarginK: settings.fadeMarginK + 10 });
    const headlineAfter = await request(app).get(scenarioPath).set('Cookie', planner).set('If-None-Match', headline.headers['etag']!);
    const resultAfter = await request(app).get(resultPath).set('Cookie', planner).set('If-None-Match', result.headers['etag']!);

    expect(headline.body.isStale).toBe(false);
    expect(changed.status).toBe(200);
    expect(headlineAfter.status).toBe(200);
    expect(headlineAfter.body.staleReasons).toEqual(["the network settings' fade margin changed after the run"]);
    expect(headlineAfter.headers['etag']).not.toBe(headline.headers['etag']);
    expect(result.body).not.toHaveProperty('staleReasons');
    expect(resultAfter.status).toBe(304);
  });

  it('keeps no-store on a missing result', async () => {
    const missing = await request(app)
      .get('/api/scenarios/00000000-0000-4000-8000-000000000000/result')
      .set('Cookie', planner)
      .set('If-None-Match', '*');

    expect(missing.status).toBe(404);
    expect(missing.headers['cache-control']).toBe('no-store');
    expect(missing.headers['etag']).toBeUndefined();
  });
});

describe('versions and staleness', () => {
  it('keeps version 1’s geometry after a route edit, marks the scenario stale, and a re-run moves it to version 2', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    await request(app)
      .put(`/api/routes/${route.id}`)
      .set('Cookie', planner)
      .send(aRouteDraft({ geometry: eastwardLine({ lengthM: 1_000, dropM: 60 }), stops: [] }));

    const stale = scenarioSchema.parse((await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', planner)).body);
    const oldResult = (await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body;
    const rerun = await request(app).post(`/api/scenarios/${scenario.id}/run`).set('Cookie', planner);

    expect(stale).toMatchObject({ routeVersion: 1, latestRouteVersion: 2, isStale: true });
    expect(stale.staleReasons[0]).toMatch(/newer version/);
    expect(oldResult.directions[0].summary.lengthM).toBeCloseTo(2_000, 0);
    expect(rerun.status).toBe(200);
    expect(rerun.body).toMatchObject({ routeVersion: 2, isStale: false, status: 'done' });
    expect(rerun.body.summary.lengthM).toBeCloseTo(1_000, 0);
  });

  it('does not mark a scenario pinned to a version stale when the route changes', async () => {
    const route = await aRoute();
    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { routeVersion: 1 }))
    ).body;
    await request(app)
      .put(`/api/routes/${route.id}`)
      .set('Cookie', planner)
      .send(aRouteDraft({ name: 'Renamed' }));

    const after = (await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', planner)).body;

    expect(after).toMatchObject({
      routeVersionPinned: true,
      routeVersion: 1,
      latestRouteVersion: 2,
      isStale: false,
      routeName: 'Spec line 1',
    });
  });

  it('refuses with 400 a passenger count that takes the bus above its 19.5 t permissible gross mass, and writes nothing', async () => {
    const route = await aRoute();
    // 13 500 kg curb + 90 × 70 kg = 19 800 kg > 19 500 kg (two-axle bus limit of the preset).
    const response = await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send(aScenarioDraft(route.id, { load: { kind: 'passengers', passengers: 90 } }));

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(
      /load\.passengers: this load takes .* to 19800 kg, above its permissible gross mass of 19500 kg/,
    );
    expect(await countRows(db, 'scenarios')).toBe(0);
  });

  it('marks the scenario stale after a vehicle-profile edit, and a re-run clears it', async () => {
    const analyst = await cookieFor('analyst');
    const preset = (await request(app).get(`/api/vehicles/${BUS}`).set('Cookie', analyst)).body;
    const own = (
      await request(app)
        .post('/api/vehicles')
        .set('Cookie', analyst)
        .send({ ...preset, name: 'Own bus' })
    ).body;
    const route = await aRoute();
    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { vehicleProfileId: own.id }))
    ).body;
    // 13 t curb: lighter, so every load case stays within the 19.5 t permissible gross mass.
    const edit = await request(app)
      .put(`/api/vehicles/${own.id}`)
      .set('Cookie', analyst)
      .send({ ...preset, name: 'Own bus', vehicle: { ...preset.vehicle, curbMassKg: 13_000 } });
    expect(edit.status).toBe(200);

    const stale = (await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', planner)).body;
    const rerun = (await request(app).post(`/api/scenarios/${scenario.id}/run`).set('Cookie', planner)).body;

    expect(stale.isStale).toBe(true);
    expect(stale.staleReasons).toEqual(['the vehicle profile changed after the run']);
    expect(rerun.isStale).toBe(false);
    expect(rerun.summary.tractionEnergyWh).not.toBeCloseTo(scenario.summary.tractionEnergyWh, 3);
  });
});

describe('staleness on the network safety settings', () => {
  it('marks the result out of date naming a changed safety setting, in the scenario and the list, and a re-run clears it', async () => {
    const admin = await cookieFor('admin');
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    const read = async () => (await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', planner)).body;
    const listed = async () =>
      (await request(app).get('/api/scenarios').set('Cookie', planner)).body.items.find((item: { id: string }) => item.id === scenario.id);
    const current = (await request(app).get('/api/settings/network').set('Cookie', admin)).body;
    const { isPlaceholder: _p, updatedAt: _u, updatedByName: _n, ...settings } = current;
    const result = (await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body;
    expect(result.inputs.provenance.safetySettings).toEqual({
      worstCaseAmbientC: settings.worstCaseAmbientC,
      fadeMarginK: settings.fadeMarginK,
      maxRoadGradePercent: settings.maxRoadGradePercent,
      crawlSpeedKph: settings.crawlSpeedKph,
      crawlDistanceM: settings.crawlDistanceM,
    });
    expect(await listed()).toMatchObject({ isStale: false, staleReasons: [] });

    // The tariff does not enter a scenario's result: still current.
    const tariff = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, energyTariffPerKWh: settings.energyTariffPerKWh * 2 });
    expect(tariff.status).toBe(200);
    expect(await read()).toMatchObject({ isStale: false, staleReasons: [] });

    // The fade margin and the crawl speed enter the descents' advice: out of date, naming both.
    const safety = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, fadeMarginK: settings.fadeMarginK + 10, crawlSpeedKph: settings.crawlSpeedKph + 1 });
    expect(safety.status).toBe(200);
    const reason = "the network settings' fade margin, crawl speed changed after the run";
    expect(await read()).toMatchObject({ isStale: true, staleReasons: [reason] });
    expect(await listed()).toMatchObject({ isStale: true, staleReasons: [reason] });

    const rerun = await request(app).post(`/api/scenarios/${scenario.id}/run`).set('Cookie', planner);
    expect(rerun.body).toMatchObject({ status: 'done', isStale: false, staleReasons: [] });
    expect(await listed()).toMatchObject({ isStale: false, staleReasons: [] });
    const rerunResult = (await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body;
    expect(rerunResult.inputs.provenance.safetySettings).toMatchObject({ fadeMarginK: settings.fadeMarginK + 10 });
  });

  it('does not mark a result stored before runs recorded their safety settings', async () => {
    const admin = await cookieFor('admin');
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    await db.$client`UPDATE scenarios SET inputs = inputs #- '{provenance,safetySettings}' WHERE id = ${scenario.id}`;
    const current = (await request(app).get('/api/settings/network').set('Cookie', admin)).body;
    const { isPlaceholder: _p, updatedAt: _u, updatedByName: _n, ...settings } = current;

    await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, fadeMarginK: settings.fadeMarginK + 10 });

    expect((await request(app).get(`/api/scenarios/${scenario.id}`).set('Cookie', planner)).body).toMatchObject({ isStale: false });
  });
});

describe('round trips and inbound runs', () => {
  it('combines both directions: round-trip energies are the sums of outbound and inbound', async () => {
    const route = await aRoute();

    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { direction: 'round-trip' }))
    ).body;
    const result = scenarioResultSchema.parse((await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body);

    const [outbound, inbound] = result.directions;
    expect(result.directions.map((d) => d.direction)).toEqual(['outbound', 'inbound']);
    expect(result.summary.batteryNetEnergyWh).toBeCloseTo(outbound!.summary.batteryNetEnergyWh + inbound!.summary.batteryNetEnergyWh, 6);
    expect(result.summary.regenEnergyWh).toBeCloseTo(outbound!.summary.regenEnergyWh + inbound!.summary.regenEnergyWh, 6);
    expect(result.summary.lengthM).toBeCloseTo(2 * outbound!.summary.lengthM, 3);
    expect(inbound!.summary.startSoc).toBeCloseTo(outbound!.summary.endSoc, 9);
    // Inbound climbs what outbound descends.
    expect(outbound!.summary.descentM).toBeGreaterThan(100);
    expect(inbound!.summary.ascentM).toBeGreaterThan(100);
    const inputs = result.inputs as { layover: { durationS: number; brakeTempBeforeC: number; brakeTempAfterC: number } };
    expect(inputs.layover.durationS).toBe(300);
    expect(inputs.layover.brakeTempAfterC).toBeLessThanOrEqual(inputs.layover.brakeTempBeforeC);
  });

  it('mirrors stops and speed limits for the inbound direction', async () => {
    const route = await aRoute();

    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { direction: 'inbound' }))
    ).body;
    const result = (await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body;

    const options = result.inputs.directions[0].request.options;
    expect(options.stops.map((stop: { atM: number }) => Math.round(stop.atM))).toEqual([600, 1_400]);
    expect(options.stops.map((stop: { name: string }) => stop.name)).toEqual(['Mill bridge', 'Lower square']);
    expect(options.speedLimitKph.at(-1)).toEqual({ fromM: expect.closeTo(1_500, 0), toM: expect.closeTo(2_000, 0), speedKph: 30 });
  });
});

describe('exports', () => {
  it('exports a CSV with the header and one row per profile point per direction', async () => {
    const route = await aRoute();
    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { direction: 'round-trip' }))
    ).body;
    const result = (await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body;

    const response = await request(app)
      .get(`/api/scenarios/${scenario.id}/export.csv`)
      .set('Cookie', await cookieFor('board'));

    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toMatch(/text\/csv/);
    expect(response.headers['content-disposition']).toMatch(/^attachment; filename="?spec-scenario\.csv"?$/);
    const lines = response.text.trim().split('\r\n');
    expect(lines[0]).toBe(`# ${ENGINEERING_CAUTION}`);
    // Headers name each quantity as the screens do, with its unit (shared presentation module).
    expect(lines[1]).toBe(profileCsvHeader());
    expect(lines[1]).toMatch(/^Direction,Distance \(m\),Longitude \(°\),Latitude \(°\),Elevation \(m\),Grade \(%\),Speed \(km\/h\)/);
    expect(lines[1]).toContain('"Brake temperature, grade-severity estimate (°C)"');
    const points = result.directions[0].profile.distanceM.length + result.directions[1].profile.distanceM.length;
    expect(lines).toHaveLength(2 + points);
    expect(lines[2]).toMatch(/^Outbound,0,/);
    expect(lines.at(-1)).toMatch(/^Inbound,/);
  });

  it('exports GeoJSON with one LineString per segment and the caution', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;
    const result = (await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body;

    const response = await request(app).get(`/api/scenarios/${scenario.id}/export.geojson`).set('Cookie', planner).buffer(true);

    expect(response.status).toBe(200);
    const collection = JSON.parse(response.text ?? response.body.toString());
    expect(collection.type).toBe('FeatureCollection');
    expect(collection.caution).toBe(ENGINEERING_CAUTION);
    const segments = collection.features.filter((feature: { properties: { kind: string } }) => feature.properties.kind === 'segment');
    expect(segments).toHaveLength(result.directions[0].profile.distanceM.length - 1);
    expect(segments[0].geometry.type).toBe('LineString');
  });

  it('exports a PDF report', async () => {
    const route = await aRoute();
    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { direction: 'round-trip' }))
    ).body;

    const response = await request(app)
      .get(`/api/scenarios/${scenario.id}/report.pdf`)
      .set('Cookie', planner)
      .buffer(true)
      .parse((res, callback) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => callback(null, Buffer.concat(chunks)));
      });

    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toBe('application/pdf');
    expect(response.headers['content-disposition']).toMatch(/spec-scenario\.pdf/);
    expect((response.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
  });
});

describe('GET /api/scenarios/:scenarioId/descent-cards.pdf', () => {
  it('prints one A4 page per descent inside the margins, with worst-case advice, cautions, sign-off fields and the drivers warning', async () => {
    const route = await aRoute({ name: 'Summit descent', geometry: eastwardLine({ lengthM: 6_000, dropM: 480 }) });
    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { direction: 'round-trip', startSoc: 0.95 }))
    ).body;
    const result = scenarioResultSchema.parse((await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body);
    const descents = result.directions.flatMap((direction) => direction.descents);

    const pdf = readPdfWords(await downloadPdf(`/api/scenarios/${scenario.id}/descent-cards.pdf`));

    expect(descents.length).toBeGreaterThan(0);
    expect(pdf.pages).toHaveLength(descents.length);
    for (const page of pdf.pages) expect([Math.round(page.width), Math.round(page.height)]).toEqual([595, 842]);
    expect(wordsOutsideMargins(pdf, MARGIN_PT)).toEqual([]);
    const first = descents[0]!;
    const text = pdf.text[0]!;
    for (const raw of RAW_VALUE_PATTERNS) expect(text).not.toMatch(raw);
    expect(text).toContain('Descent card: Summit descent');
    expect(text).toContain('Not for drivers without engineering sign-off.');
    expect(text).toContain('Advice under the worst credible case');
    expect(text).toContain(`Risk ${RISK_LABELS[first.risk]} (worst case)`);
    if (first.worstCase?.speedAdvice === 'limit') {
      expect(text).toContain(
        `At or below ${formatSafeSpeed(first.worstCase.maxSafeSpeedKph!, 'metric')} on the whole descent, even with regeneration lost.`,
      );
    }
    expect(text).toContain('regeneration unavailable');
    expect(text).toContain('Where to stop to cool');
    expect(text).toMatch(/\d+ (m|km)/); // the scale bar
    for (const caution of ADVICE_CAUTIONS) expect(text).toContain(caution);
    for (const field of ['Checked by (licensed engineer)', 'Approved by (safety officer)', 'Issued to the depot by'])
      expect(text).toContain(field);
  });

  it('prints the one descent of a direction that covers a point, and answers 404 where there is none and 400 for half a choice', async () => {
    const route = await aRoute({ name: 'Summit descent', geometry: eastwardLine({ lengthM: 6_000, dropM: 480 }) });
    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(aScenarioDraft(route.id, { startSoc: 0.95 }))
    ).body;
    const result = scenarioResultSchema.parse((await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body);
    const descent = result.directions[0]!.descents[0]!;

    const one = readPdfWords(
      await downloadPdf(`/api/scenarios/${scenario.id}/descent-cards.pdf?direction=outbound&atM=${(descent.startM + descent.endM) / 2}`),
    );
    const none = await request(app)
      .get(`/api/scenarios/${scenario.id}/descent-cards.pdf`)
      .query({ direction: 'inbound', atM: 10 })
      .set('Cookie', planner);
    const half = await request(app)
      .get(`/api/scenarios/${scenario.id}/descent-cards.pdf`)
      .query({ direction: 'outbound' })
      .set('Cookie', planner);

    expect(one.pages).toHaveLength(1);
    expect(none.status).toBe(404);
    expect(none.body.error.message).toContain('inbound descent');
    expect(half.status).toBe(400);
    expect(JSON.stringify(half.body.error)).toContain('atM');
  });
});

describe('the PDF report as printed (issue 10)', () => {
  it('keeps every word inside the A4 margins, prints human labels and local dates, and keeps the caution whole', async () => {
    const route = await aRoute({
      name: 'Long pass road from the lower valley terminus over the Korvel saddle to the upper village green and back',
      geometry: eastwardLine({ lengthM: 6_000, dropM: 480 }),
    });
    const scenario = (
      await request(app)
        .post('/api/scenarios')
        .set('Cookie', planner)
        .send(
          aScenarioDraft(route.id, {
            name: 'Round trip with a full standing load in winter, charged to the top before the descent',
            direction: 'round-trip',
            startSoc: 0.97,
          }),
        )
    ).body;
    const result = scenarioResultSchema.parse((await request(app).get(`/api/scenarios/${scenario.id}/result`).set('Cookie', planner)).body);

    const pdf = readPdfWords(await downloadPdf(`/api/scenarios/${scenario.id}/report.pdf`));

    for (const page of pdf.pages) expect([Math.round(page.width), Math.round(page.height)]).toEqual([595, 842]);
    expect(wordsOutsideMargins(pdf, MARGIN_PT)).toEqual([]);
    const all = pdf.text.join(' ');
    for (const raw of RAW_VALUE_PATTERNS) expect(all).not.toMatch(raw);
    expect(all).toContain('Full standing load');
    expect(all).toMatch(/computed \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d/);
    // The same names and values as the result screen (the shared figure catalogue).
    for (const figure of SUMMARY_FIGURES) {
      expect(all).toContain(figure.label);
      expect(all).toContain(formatFigure(figure, result.summary, 'metric'));
    }
    // The caution never splits across pages, and no page is left almost empty by a spill.
    const cautionStart = ENGINEERING_CAUTION.split(' ').slice(0, 6).join(' ');
    const cautionEnd = ENGINEERING_CAUTION.split(' ').slice(-4).join(' ');
    for (const text of pdf.text.filter((page) => page.includes(cautionStart))) expect(text).toContain(cautionEnd);
    for (const text of pdf.text) expect(text.split(' ').length).toBeGreaterThan(40);
    // The advice cautions stand whole under the descents table, on one page.
    const advicePage = pdf.text.find((page) => page.includes(ADVICE_CAUTIONS_TITLE));
    expect(advicePage).toBeDefined();
    for (const caution of ADVICE_CAUTIONS) expect(advicePage).toContain(caution);
    expect(all.indexOf(ADVICE_CAUTIONS_TITLE)).toBeGreaterThan(all.indexOf('Advice (rounded toward safety)'));
  });
});

describe('GET /api/scenarios', () => {
  it('filters by route, vehicle profile and in-service flag', async () => {
    const first = await aRoute();
    const second = await aRoute({ name: 'Spec line 2' });
    await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send(aScenarioDraft(first.id, { name: 'A', inService: true }));
    await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send(aScenarioDraft(second.id, { name: 'B' }));
    await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send(aScenarioDraft(second.id, { name: 'C', vehicleProfileId: presetProfileId('battery-midibus') }));
    const board = await cookieFor('board');

    const names = async (query: string) =>
      ((await request(app).get(`/api/scenarios${query}`).set('Cookie', board)).body.items as { name: string }[]).map((item) => item.name);

    expect(await names('')).toEqual(['A', 'B', 'C']);
    expect(await names(`?routeId=${second.id}`)).toEqual(['B', 'C']);
    expect(await names(`?vehicleProfileId=${presetProfileId('battery-midibus')}`)).toEqual(['C']);
    expect(await names('?inService=true')).toEqual(['A']);
  });
});

describe('GET /api/scenarios/compare', () => {
  it('returns two to four scenarios with their results, in the order asked', async () => {
    const route = await aRoute();
    const ids: string[] = [];
    for (const name of ['A', 'B', 'C']) {
      ids.push((await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id, { name }))).body.id);
    }

    const response = await request(app).get(`/api/scenarios/compare?ids=${ids[2]},${ids[0]}`).set('Cookie', planner);

    expect(response.status).toBe(200);
    expect(response.body.items.map((item: { scenario: { name: string } }) => item.scenario.name)).toEqual(['C', 'A']);
    expect(response.body.items[0].result.summary.lengthM).toBeGreaterThan(0);
    expect(response.body.caution).toBe(ENGINEERING_CAUTION);
  });

  it('answers 400 naming ids for one id or five', async () => {
    const one = await request(app).get('/api/scenarios/compare?ids=00000000-0000-4000-8000-000000000001').set('Cookie', planner);
    const five = await request(app)
      .get(`/api/scenarios/compare?ids=${[1, 2, 3, 4, 5].map((n) => `00000000-0000-4000-8000-00000000000${n}`).join(',')}`)
      .set('Cookie', planner);

    expect(one.status).toBe(400);
    expect(one.body.error.message).toMatch(/ids/);
    expect(five.status).toBe(400);
  });
});

describe('deleting what scenarios use', () => {
  it('refuses to delete a route used by scenarios, naming how many', async () => {
    const route = await aRoute();
    await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id));
    await request(app)
      .post('/api/scenarios')
      .set('Cookie', planner)
      .send(aScenarioDraft(route.id, { name: 'Second' }));

    const response = await request(app).delete(`/api/routes/${route.id}`).set('Cookie', planner);

    expect(response.status).toBe(409);
    expect(response.body.error.message).toMatch(/2 scenarios/);
    expect(await countRows(db, 'road_routes')).toBe(1);
  });

  it('deletes a scenario, after which its route can go', async () => {
    const route = await aRoute();
    const scenario = (await request(app).post('/api/scenarios').set('Cookie', planner).send(aScenarioDraft(route.id))).body;

    const deleted = await request(app)
      .delete(`/api/scenarios/${scenario.id}`)
      .set('Cookie', await cookieFor('analyst'));
    const routeDeleted = await request(app).delete(`/api/routes/${route.id}`).set('Cookie', planner);

    expect(deleted.status).toBe(204);
    expect(routeDeleted.status).toBe(204);
  });
});

// Helpers

async function downloadPdf(path: string): Promise<Buffer> {
  const response = await request(app)
    .get(path)
    .set('Cookie', planner)
    .buffer(true)
    .parse((res, callback) => {
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => callback(null, Buffer.concat(chunks)));
    });
  expect(response.status).toBe(200);
  return response.body as Buffer;
}

async function aRoute(overrides: Parameters<typeof aRouteDraft>[0] = {}) {
  const response = await request(app).post('/api/routes').set('Cookie', planner).send(aRouteDraft(overrides));
  if (response.status !== 201) throw new Error(`route: ${response.status} ${response.text}`);
  return response.body as { id: string };
}

function aScenarioDraft(routeId: string, overrides: Partial<ScenarioDraftInput> = {}): ScenarioDraftInput {
  return {
    name: 'Spec scenario',
    routeId,
    vehicleProfileId: BUS,
    load: { kind: 'case', case: 'full-standing' },
    season: { kind: 'season', season: 'winter' },
    startSoc: 0.7,
    ...overrides,
  };
}
