import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { boardSummarySchema } from '@shared/domain/board-summary';
import { serviceDayListSchema, serviceDayResultSchema, serviceDaySchema, type ServiceDayDraftInput } from '@shared/domain/service-days';
import { ENGINE_VERSION } from '@shared/engine/constants';
import {
  SERVICE_DAY_COLUMNS,
  boardFigures,
  boardYear,
  boardYearSource,
  formatBoardEnergy,
  serviceDayCsvHeader,
} from '@shared/presentation/index';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { waitForInlineServiceDayRuns } from '../../../api/service-days/service-days-service';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';
import { aRouteDraft, pointNear } from '../../support/road-route-builders';

const context = createTestContext();
const { app, db } = context;
const BUS = presetProfileId('battery-bus-12m');
let cookieFor: ReturnType<typeof sessionCookies>;
let analyst: string;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
  analyst = await cookieFor('analyst');
});
afterAll(() => context.close());

async function aRoute(): Promise<{ id: string }> {
  const response = await request(app)
    .post('/api/routes')
    .set('Cookie', await cookieFor('planner'))
    .send(aRouteDraft());
  if (response.status !== 201) throw new Error(`route: ${response.status} ${response.text}`);
  return response.body as { id: string };
}

/** Two blocks on the 2 km spec line (falling 120 m eastwards): a depot at its west end, a terminus charger at its east end. */
function aDay(routeId: string, overrides: Partial<ServiceDayDraftInput> = {}): ServiceDayDraftInput {
  const depot = pointNear(0);
  const terminus = pointNear(2_000);
  return {
    name: 'Winter weekday',
    dayType: 'weekday',
    season: 'winter',
    chargers: [
      {
        key: 'depot',
        name: 'West depot',
        kind: 'depot',
        position: [depot.lon, depot.lat],
        powerW: 100_000,
        efficiency: 0.92,
        targetSoc: 0.95,
      },
      {
        key: 'east',
        name: 'East terminus',
        kind: 'terminus',
        position: [terminus.lon, terminus.lat],
        powerW: 300_000,
        efficiency: 0.9,
        targetSoc: 0.9,
      },
    ],
    blocks: [
      {
        blockId: 'B1',
        vehicleProfileId: BUS,
        depotChargerKey: 'depot',
        pullOutS: 6 * 3600,
        pullInS: 9 * 3600,
        startSoc: 0.8,
        trips: [
          { routeId, direction: 'outbound', departureS: 6 * 3600 + 600 },
          { routeId, direction: 'inbound', departureS: 7 * 3600 },
          { routeId, direction: 'outbound', departureS: 7 * 3600 + 1800 },
          { routeId, direction: 'inbound', departureS: 8 * 3600 },
        ],
      },
      {
        blockId: 'B2',
        vehicleProfileId: BUS,
        pullOutS: 7 * 3600,
        pullInS: 8 * 3600 + 1800,
        startSoc: 0.6,
        trips: [
          { routeId, direction: 'outbound', departureS: 7 * 3600 + 300, load: { kind: 'case', case: 'full-standing' } },
          { routeId, direction: 'inbound', departureS: 7 * 3600 + 2400 },
        ],
      },
    ],
    ...overrides,
  };
}

describe('saving service days', () => {
  it('saves a day (201), reads it back and lists it with its block and trip counts', async () => {
    const route = await aRoute();

    const created = await request(app).post('/api/service-days').set('Cookie', analyst).send(aDay(route.id));

    expect(created.status).toBe(201);
    const day = serviceDaySchema.parse(created.body);
    expect(created.headers['location']).toBe(`/api/service-days/${day.id}`);
    expect(day).toMatchObject({ name: 'Winter weekday', status: null, isStale: false, reserveSoc: 0.15, batteryAge: 'beginning-of-life' });
    expect(day.blocks.map((block) => block.trips.length)).toEqual([4, 2]);
    const read = await request(app)
      .get(`/api/service-days/${day.id}`)
      .set('Cookie', await cookieFor('board'));
    expect(read.status).toBe(200);
    expect(read.body.chargers.map((charger: { key: string }) => charger.key)).toEqual(['depot', 'east']);
    const list = serviceDayListSchema.parse(
      (
        await request(app)
          .get('/api/service-days')
          .set('Cookie', await cookieFor('safety'))
      ).body,
    );
    expect(list.items).toHaveLength(1);
    expect(list.items[0]).toMatchObject({ id: day.id, blockCount: 2, tripCount: 6 });
  });

  it('refuses an unknown route with 422 naming the block and the trip, and saves nothing', async () => {
    const route = await aRoute();
    const draft = aDay(route.id);
    draft.blocks[1]!.trips[1]!.routeId = '00000000-0000-4000-8000-000000000000';

    const response = await request(app).post('/api/service-days').set('Cookie', analyst).send(draft);

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('unknown_route');
    expect(response.body.error.message).toContain('block “B2” (blocks[1]), trip 2');
    expect(response.body.error.details).toMatchObject({ blockId: 'B2', tripIndex: 1, field: 'routeId' });
    expect(await countRows(db, 'service_days')).toBe(0);
  });

  it('refuses an unknown charger, a missing route version and trips out of order, each named', async () => {
    const route = await aRoute();
    const unknownCharger = aDay(route.id);
    unknownCharger.blocks[0]!.depotChargerKey = 'north';
    const badVersion = aDay(route.id);
    badVersion.blocks[0]!.trips[2]!.routeVersion = 7;
    const outOfOrder = aDay(route.id);
    outOfOrder.blocks[0]!.trips[1]!.departureS = 6 * 3600;

    const charger = await request(app).post('/api/service-days').set('Cookie', analyst).send(unknownCharger);
    const version = await request(app).post('/api/service-days').set('Cookie', analyst).send(badVersion);
    const order = await request(app).post('/api/service-days').set('Cookie', analyst).send(outOfOrder);

    expect(charger.status).toBe(422);
    expect(charger.body.error).toMatchObject({ code: 'unknown_charger', details: { blockId: 'B1', field: 'depotChargerKey' } });
    expect(charger.body.error.message).toContain('“north”');
    expect(version.status).toBe(422);
    expect(version.body.error.message).toContain('trip 3: the route has no version 7 (latest is 1)');
    expect(order.status).toBe(422);
    expect(order.body.error.details).toMatchObject({ blockId: 'B1', tripIndex: 1, field: 'departureS' });
    expect(await countRows(db, 'service_days')).toBe(0);
  });

  it('refuses a malformed draft with 400 naming the field', async () => {
    const route = await aRoute();
    const response = await request(app)
      .post('/api/service-days')
      .set('Cookie', analyst)
      .send({ ...aDay(route.id), reserveSoc: 0.9 });

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body.error)).toContain('reserveSoc');
  });

  it('lets analysts and admins write, and refuses planners, safety officers and the board', async () => {
    const route = await aRoute();
    for (const role of ['planner', 'safety', 'board'] as const) {
      const refused = await request(app)
        .post('/api/service-days')
        .set('Cookie', await cookieFor(role))
        .send(aDay(route.id));
      expect(refused.status, role).toBe(403);
    }
    const byAdmin = await request(app)
      .post('/api/service-days')
      .set('Cookie', await cookieFor('admin'))
      .send(aDay(route.id));
    expect(byAdmin.status).toBe(201);
  });

  it('deletes restorably: gone from reads, listed as deleted, back on restore, every step in the audit log', async () => {
    const route = await aRoute();
    const day = (await request(app).post('/api/service-days').set('Cookie', analyst).send(aDay(route.id))).body;

    expect((await request(app).delete(`/api/service-days/${day.id}`).set('Cookie', analyst)).status).toBe(204);
    expect((await request(app).get(`/api/service-days/${day.id}`).set('Cookie', analyst)).status).toBe(404);
    const deleted = (await request(app).get('/api/deleted-items').set('Cookie', analyst)).body;
    expect(deleted.items).toContainEqual(expect.objectContaining({ kind: 'service-day', id: day.id, name: 'Winter weekday' }));
    const restored = await request(app).post(`/api/service-days/${day.id}/restore`).set('Cookie', analyst);
    expect(restored.status).toBe(200);
    expect((await request(app).get(`/api/service-days/${day.id}`).set('Cookie', analyst)).status).toBe(200);
    const audit = (
      await request(app)
        .get(`/api/audit-log?entityId=${day.id}`)
        .set('Cookie', await cookieFor('admin'))
    ).body;
    expect(audit.items.map((event: { action: string }) => event.action).sort()).toEqual(['create', 'delete', 'restore']);
  });
});

describe('running a service day', () => {
  it('answers 404 before the first run, then runs through the queue to a stored result whose energy balances', async () => {
    const route = await aRoute();
    const day = (await request(app).post('/api/service-days').set('Cookie', analyst).send(aDay(route.id))).body;
    const before = await request(app).get(`/api/service-days/${day.id}/result`).set('Cookie', analyst);
    expect(before.status).toBe(404);
    expect(before.body.error.message).toContain('not been run yet');

    const queued = await request(app).post(`/api/service-days/${day.id}/run`).set('Cookie', analyst);
    expect(queued.status).toBe(202);
    expect(queued.headers['location']).toBe(`/api/service-days/${day.id}/result`);
    await waitForInlineServiceDayRuns(context.deps);

    const after = serviceDaySchema.parse((await request(app).get(`/api/service-days/${day.id}`).set('Cookie', analyst)).body);
    expect(after).toMatchObject({ status: 'done', isStale: false, failureReason: null });
    const response = await request(app)
      .get(`/api/service-days/${day.id}/result`)
      .set('Cookie', await cookieFor('board'));
    expect(response.status).toBe(200);
    const result = serviceDayResultSchema.parse(response.body);
    expect(result.engineVersion).toBe(ENGINE_VERSION);
    expect(result.blocks.map((block) => block.blockId)).toEqual(['B1', 'B2']);
    const capacityWh = (await db.query.vehicleProfiles.findFirst({ where: (p, { eq }) => eq(p.id, BUS) }))!.vehicle.batteryCapacityWh;
    const startSoc = { B1: 0.8, B2: 0.6 } as Record<string, number>;
    for (const block of result.blocks) {
      // (start SOC − end SOC) × usable capacity + energy charged into the battery = net battery energy of trips and layovers.
      const left = (startSoc[block.blockId]! - block.endSoc) * capacityWh + block.chargedEnergyWh;
      expect(Math.abs(left - block.tripNetEnergyWh)).toBeLessThanOrEqual(0.005 * Math.abs(block.tripNetEnergyWh));
      expect(block.socTrace.length).toBeGreaterThan(4);
    }
    // B1 stands 7 min or more at the east terminus after each outbound trip: the charger there tops it up.
    const b1 = result.blocks.find((block) => block.blockId === 'B1')!;
    expect(b1.chargingEvents.filter((event) => event.chargerKey === 'east').length).toBeGreaterThan(0);
    expect(b1.chargedEnergyWh).toBeGreaterThan(0);
  });

  it('marks the result stale when the day is changed, keeping the last result', async () => {
    const route = await aRoute();
    const day = (await request(app).post('/api/service-days').set('Cookie', analyst).send(aDay(route.id))).body;
    await request(app).post(`/api/service-days/${day.id}/run`).set('Cookie', analyst);
    await waitForInlineServiceDayRuns(context.deps);

    const changed = await request(app)
      .put(`/api/service-days/${day.id}`)
      .set('Cookie', analyst)
      .send(aDay(route.id, { name: 'Winter weekday, late' }));

    expect(changed.status).toBe(200);
    expect(changed.body).toMatchObject({ name: 'Winter weekday, late', isStale: true, status: 'done' });
    expect(changed.body.staleReasons).toContain('the service day was changed after the run');
    expect((await request(app).get(`/api/service-days/${day.id}/result`).set('Cookie', analyst)).status).toBe(200);
  });

  it('follows a change of the network settings: stale after a safety setting it ran with, annual figures recounted with new day counts and tariff', async () => {
    const route = await aRoute();
    const admin = await cookieFor('admin');
    const board = await cookieFor('board');
    const day = (
      await request(app)
        .post('/api/service-days')
        .set('Cookie', analyst)
        .send(aDay(route.id, { inService: true }))
    ).body;
    await request(app).post(`/api/service-days/${day.id}/run`).set('Cookie', analyst);
    await waitForInlineServiceDayRuns(context.deps);
    const read = async () => (await request(app).get(`/api/service-days/${day.id}`).set('Cookie', analyst)).body;
    const annual = async () => boardSummarySchema.parse((await request(app).get('/api/board/summary').set('Cookie', board)).body).annual;
    const current = (await request(app).get('/api/settings/network').set('Cookie', admin)).body;
    const { isPlaceholder: _p, updatedAt: _u, updatedByName: _n, ...settings } = current;
    expect(await read()).toMatchObject({ isStale: false, staleReasons: [] });
    const before = await annual();

    // Tariff and day counts: the day's result does not depend on them, so it stays current; the
    // board's annual figures are counted afresh from the new settings at once.
    const dayCounts = { ...current.dayCounts, weekday: { ...current.dayCounts.weekday, winter: 72, mild: 115 } };
    const tariffChanged = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, energyTariffPerKWh: settings.energyTariffPerKWh * 2, dayCounts });
    expect(tariffChanged.status).toBe(200);
    expect(await read()).toMatchObject({ isStale: false, staleReasons: [] });
    const after = await annual();
    expect(after.serviceDays[0]!.daysPerYear).toBe(72);
    expect(after.gridEnergyKWh).toBeCloseTo((before.gridEnergyKWh / 62) * 72, 6);
    expect(after.energyCost).toBeCloseTo(after.gridEnergyKWh * settings.energyTariffPerKWh * 2, 6);

    // A safety setting the descents' worst case ran with: the stored result is out of date, and says which.
    const safetyChanged = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, dayCounts, worstCaseAmbientC: settings.worstCaseAmbientC + 5 });
    expect(safetyChanged.status).toBe(200);
    const stale = await read();
    expect(stale.isStale).toBe(true);
    expect(stale.staleReasons).toEqual(["the network settings' worst-case ambient temperature changed after the run"]);
    expect((await annual()).serviceDays[0]!.isStale).toBe(true);

    // Run again: current once more.
    await request(app).post(`/api/service-days/${day.id}/run`).set('Cookie', analyst);
    await waitForInlineServiceDayRuns(context.deps);
    expect(await read()).toMatchObject({ isStale: false, staleReasons: [] });
  });

  it('exports the result as CSV: the caution, the shared header, one row per block, charging event and descent', async () => {
    const route = await aRoute();
    const day = (await request(app).post('/api/service-days').set('Cookie', analyst).send(aDay(route.id))).body;
    await request(app).post(`/api/service-days/${day.id}/run`).set('Cookie', analyst);
    await waitForInlineServiceDayRuns(context.deps);
    const result = serviceDayResultSchema.parse((await request(app).get(`/api/service-days/${day.id}/result`).set('Cookie', analyst)).body);

    const response = await request(app)
      .get(`/api/service-days/${day.id}/result.csv`)
      .set('Cookie', await cookieFor('planner'));

    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toContain('text/csv');
    expect(response.headers['content-disposition']).toContain('.csv');
    const lines = response.text.trimEnd().split('\r\n');
    expect(lines[0]!.startsWith('# ')).toBe(true);
    expect(lines[1]).toBe(serviceDayCsvHeader());
    const rows = lines.slice(2).map((line) => line.split(','));
    const expectedRows = result.blocks.reduce((sum, block) => sum + 1 + block.chargingEvents.length + block.descents.length, 0);
    expect(rows).toHaveLength(expectedRows);
    const endSocColumn = SERVICE_DAY_COLUMNS.findIndex((column) => column.key === 'endSocPercent');
    const b2 = rows.find((row) => row[0] === 'block' && row[1] === 'B2')!;
    expect(Number(b2[endSocColumn])).toBeCloseTo(result.blocks[1]!.endSoc * 100, 1);
  });
});

describe('the board summary’s annual basis', () => {
  it('stays on the scenarios while no service day is in service, then counts the in-service day × its days per year', async () => {
    const route = await aRoute();
    const board = await cookieFor('board');
    const before = (await request(app).get('/api/board/summary').set('Cookie', board)).body;
    expect(before.annual.basis).toBe('scenarios');
    expect(before.annual.basisText).toContain('No service day is in service');

    const day = (
      await request(app)
        .post('/api/service-days')
        .set('Cookie', analyst)
        .send(aDay(route.id, { inService: true }))
    ).body;
    await request(app).post(`/api/service-days/${day.id}/run`).set('Cookie', analyst);
    await waitForInlineServiceDayRuns(context.deps);
    const result = serviceDayResultSchema.parse((await request(app).get(`/api/service-days/${day.id}/result`).set('Cookie', analyst)).body);

    const summary = boardSummarySchema.parse((await request(app).get('/api/board/summary').set('Cookie', board)).body);
    const annual = summary.annual;
    expect(annual.basis).toBe('service-days');
    expect(annual.basisText).toContain('× the days of its day type and season');
    // Shipped day counts: 62 winter weekdays.
    expect(annual.serviceDays).toEqual([expect.objectContaining({ id: day.id, daysPerYear: 62, infeasibleBlocks: 0, isStale: false })]);
    const dayNetKWh = result.blocks.reduce((total, block) => total + block.tripNetEnergyWh, 0) / 1_000;
    expect(annual.netEnergyKWh).toBeCloseTo(dayNetKWh * 62, 6);
    // Six trips of the 2 km line.
    expect(annual.serviceDays[0]!.dayKm).toBeCloseTo(12, 1);
    expect(annual.annualKm).toBeCloseTo(12 * 62, 0);
    // Grid energy is never less than what the batteries used (charger losses come on top).
    expect(annual.gridEnergyKWh).toBeGreaterThan(annual.netEnergyKWh);
    expect(annual.energyCost).toBeCloseTo(annual.gridEnergyKWh * summary.settings.energyTariffPerKWh, 6);
    // Baseline: the shipped reference diesel bus, 0.45 l/km × 2.68 kg CO2/l.
    expect(annual.baseline.co2Kg).toBeCloseTo(annual.annualKm * 0.45 * 2.68, 3);
    expect(annual.baseline.co2SavedKg).toBeCloseTo(annual.baseline.co2Kg - annual.co2Kg, 6);
    expect(annual.notCovered).toHaveLength(8);
    expect(annual.peakCharging.find((peak) => peak.chargerKey === 'east')!.daytimePeakW).toBeGreaterThan(0);
    // One block returns to the depot charger of 100 kW.
    expect(annual.peakCharging.find((peak) => peak.chargerKey === 'depot')!.overnightPeakW).toBe(100_000);
    const tariffRow = annual.sensitivity.find((row) => row.factor === 'Energy tariff')!;
    expect(tariffRow.energyCostDelta).toBeCloseTo(0.1 * annual.energyCost, 6);
    // The existing scenario-based fields are still there.
    expect(summary.totals).toMatchObject({ annualKm: 0, annualNetKWh: 0 });

    // The headline figures count the same year: the day's braking energy × its 62 days, not the scenarios.
    const dayRegenKWh = result.blocks.reduce((total, block) => total + block.regenEnergyWh!, 0) / 1_000;
    const dayFrictionKWh = result.blocks.reduce((total, block) => total + block.frictionBrakeEnergyWh!, 0) / 1_000;
    expect(dayRegenKWh).toBeGreaterThan(0);
    expect(annual.regenEnergyKWh).toBeCloseTo(dayRegenKWh * 62, 6);
    expect(annual.frictionBrakeEnergyKWh).toBeCloseTo(dayFrictionKWh * 62, 6);
    const year = boardYear(summary);
    expect(year).toMatchObject({ basis: 'service-days', netKWh: annual.netEnergyKWh, km: annual.annualKm });
    expect(year.regenValue).toBeCloseTo(annual.regenEnergyKWh! * summary.settings.energyTariffPerKWh, 6);
    const figures = boardFigures(summary);
    expect(figures.find((figure) => figure.key === 'recovered')!.value).toBe(formatBoardEnergy(annual.regenEnergyKWh!));
    expect(figures.find((figure) => figure.key === 'friction')!.value).toBe(formatBoardEnergy(annual.frictionBrakeEnergyKWh!));
    expect(boardYearSource(summary)).toContain('service days in service');
    expect(boardYear(before).basis).toBe('scenarios');
    // A day run before braking energy was reported: the headline stays on the scenarios and says why.
    const older = { ...summary, annual: { ...annual, regenEnergyKWh: null, frictionBrakeEnergyKWh: null } };
    expect(boardYear(older)).toMatchObject({ basis: 'scenarios', regenKWh: summary.totals.annualRegenKWh });
    expect(boardYearSource(older)).toContain('run it again');
  });

  it('refuses day counts that do not make a year with 422, keeping the stored ones', async () => {
    const admin = await cookieFor('admin');
    const current = (await request(app).get('/api/settings/network').set('Cookie', admin)).body;
    const { isPlaceholder: _p, updatedAt: _u, updatedByName: _n, ...settings } = current;
    const dayCounts = { ...current.dayCounts, weekday: { winter: 70, mild: 125, summer: 63 } };

    const refused = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, dayCounts });

    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toContain('add up to 373');
    const after = (await request(app).get('/api/settings/network').set('Cookie', admin)).body;
    expect(after.dayCounts).toEqual(current.dayCounts);
    const saved = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...settings, dayCounts: { ...dayCounts, saturday: { winter: 5, mild: 26, summer: 13 } } });
    expect(saved.status).toBe(200);
    expect(saved.body.dayCounts.weekday.winter).toBe(70);
  });
});
