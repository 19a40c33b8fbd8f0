import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { boardSummarySchema, networkSettingsViewSchema } from '@shared/domain/board-summary';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import { ensureNetworkSettings } from '../../../api/board/network-settings';
import { eq } from 'drizzle-orm';
import { reviewItems, type ScenarioRow } from '../../../api/db/schema/index';
import { MARGIN_PT } from '../../../api/pdf/pdf-layout';
import { RAW_VALUE_PATTERNS, readPdfWords, wordsOutsideMargins } from '../../support/pdf-words';
import { ADVICE_CAUTIONS } from '@shared/presentation/index';
import { syncReviewItems } from '../../../api/reviews/review-sync';
import { aDescent, aDirectionResult, aRoute, aScenario, aSummary, aVehicleProfile } from '../../support/scenario-fixtures';
import { sessionCookies } from '../../support/session-cookie';
import { createTestContext, signedInAgent } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;
let cookieFor: ReturnType<typeof sessionCookies>;

beforeEach(async () => {
  await truncateAll(db);
  cookieFor = sessionCookies(db, context.deps.config);
});
afterAll(() => context.close());

describe('GET /api/board/summary', () => {
  it('annualises the latest in-service scenario of each route and prices its regeneration', async () => {
    await setFactors({ energyTariffPerKWh: 0.25, gridEmissionFactorKgPerKWh: 0.4 });
    const profile = await aVehicleProfile(db, { name: 'Battery bus 12 m' });
    const pass = await aRoute(db, { name: 'Pass road', tripsPerDay: 10, serviceDaysPerYear: 300 });
    const valley = await aRoute(db, { name: 'Valley link', tripsPerDay: 4, serviceDaysPerYear: 250 });
    // Pass road: an older in-service result and a scenario not in service, both ignored.
    await aScenario(db, {
      routeId: pass.id,
      vehicleProfileId: profile.id,
      name: 'Old',
      inService: true,
      computedAt: new Date('2026-01-01T00:00:00Z'),
      summary: aSummary({ regenEnergyWh: 99_000 }),
    });
    await aScenario(db, {
      routeId: pass.id,
      vehicleProfileId: profile.id,
      name: 'Draft',
      inService: false,
      summary: aSummary({ regenEnergyWh: 77_000 }),
    });
    await aScenario(db, {
      routeId: pass.id,
      vehicleProfileId: profile.id,
      name: 'Pass winter',
      inService: true,
      computedAt: new Date('2026-06-01T00:00:00Z'),
      summary: aSummary({ lengthM: 2_300, regenEnergyWh: 2_000, frictionBrakeEnergyWh: 1_000, batteryNetEnergyWh: 2_300, kWhPerKm: 1 }),
    });
    await aScenario(db, {
      routeId: valley.id,
      vehicleProfileId: profile.id,
      name: 'Valley all year',
      direction: 'round-trip',
      inService: true,
      summary: aSummary({ lengthM: 8_000, regenEnergyWh: 5_500, frictionBrakeEnergyWh: 800, batteryNetEnergyWh: 4_000, kWhPerKm: 0.5 }),
    });

    const response = await request(app)
      .get('/api/board/summary')
      .set('Cookie', await cookieFor('board'));

    expect(response.status).toBe(200);
    const summary = boardSummarySchema.parse(response.body);
    // Pass road: 10 trips × 300 days = 3 000 trips; Valley link: 4 × 250 = 1 000 trips.
    expect(
      summary.routes.map((route) => [
        route.routeName,
        route.scenarioName,
        route.annualKm,
        route.annualRegenKWh,
        route.annualFrictionBrakeKWh,
        route.annualNetKWh,
      ]),
    ).toEqual([
      ['Pass road', 'Pass winter', 6_900, 6_000, 3_000, 6_900],
      ['Valley link', 'Valley all year', 8_000, 5_500, 800, 4_000],
    ]);
    expect(summary.routes[1]).toMatchObject({
      direction: 'round-trip',
      tripsPerDay: 4,
      serviceDaysPerYear: 250,
      kWhPerKm: 0.5,
      vehicleProfileName: 'Battery bus 12 m',
    });
    expect(summary.totals).toMatchObject({ annualKm: 14_900, annualRegenKWh: 11_500, annualFrictionBrakeKWh: 3_800, annualNetKWh: 10_900 });
    // 11 500 kWh × 0.25 EUR/kWh; 11 500 kWh × 0.4 kg/kWh.
    expect(summary.totals.regenValue).toBeCloseTo(2_875, 9);
    expect(summary.totals.co2AvoidedKg).toBeCloseTo(4_600, 9);
    expect(summary.settings).toMatchObject({ currency: 'CHF', energyTariffPerKWh: 0.25 });
    expect(summary.caution).toBe(ENGINEERING_CAUTION);
  });

  it('counts open safety items by risk and lists the steepest in-service descents with their review items', async () => {
    const profile = await aVehicleProfile(db);
    const route = await aRoute(db, { name: 'Col road' });
    const descents = [
      aDescent({ startM: 100, endM: 400, meanGradePercent: -4, risk: 'low', peakBrakeTempC: 120 }),
      aDescent({ startM: 500, endM: 900, meanGradePercent: -11.5, risk: 'critical', peakBrakeTempC: 620 }),
      aDescent({ startM: 1_000, endM: 1_400, meanGradePercent: -9, risk: 'high' }),
      aDescent({ startM: 1_500, endM: 1_800, meanGradePercent: -6, risk: 'elevated', peakBrakeTempC: 320 }),
      aDescent({ startM: 1_850, endM: 2_000, meanGradePercent: -5, risk: 'elevated', peakBrakeTempC: 310 }),
      aDescent({ startM: 2_050, endM: 2_250, meanGradePercent: -7, risk: 'low', peakBrakeTempC: 200 }),
    ];
    const scenario = await aScenario(db, {
      routeId: route.id,
      vehicleProfileId: profile.id,
      inService: true,
      directionResults: [aDirectionResult('outbound', descents)],
    });
    await sync(scenario);
    const safety = await cookieFor('safety');
    const items = (await request(app).get('/api/reviews').query({ risk: 'elevated' }).set('Cookie', safety)).body.items;
    await request(app).post(`/api/reviews/${items[0].id}/transitions`).set('Cookie', safety).send({ action: 'acknowledge' });
    await request(app)
      .post(`/api/reviews/${items[0].id}/transitions`)
      .set('Cookie', safety)
      .send({ action: 'accept', reason: 'Short stretch, drivers briefed' });
    const second = await signedInAgent(app, db, 'safety');
    await second.agent.post(`/api/reviews/${items[0].id}/transitions`).send({ action: 'sign-off' });

    const summary = boardSummarySchema.parse(
      (
        await request(app)
          .get('/api/board/summary')
          .set('Cookie', await cookieFor('board'))
      ).body,
    );

    expect(summary.openSafetyItems).toEqual({ elevated: 1, high: 1, critical: 1 });
    expect(summary.steepestDescents.map((descent) => descent.meanGradePercent)).toEqual([-11.5, -9, -7, -6, -5]);
    expect(summary.steepestDescents[0]!.reviewId).not.toBeNull();
    expect(summary.steepestDescents[2]).toMatchObject({ risk: 'low', reviewId: null });
  });

  it('shows the placeholder factors, said to be placeholders, until an admin sets real ones', async () => {
    await ensureNetworkSettings(db);

    const settings = networkSettingsViewSchema.parse(
      (
        await request(app)
          .get('/api/settings/network')
          .set('Cookie', await cookieFor('planner'))
      ).body,
    );

    expect(settings.isPlaceholder).toBe(true);
    expect(settings.tariffSource).toMatch(/Illustrative placeholder/);
    expect(settings.emissionFactorSource).toMatch(/Illustrative placeholder/);
  });
});

describe('PUT /api/settings/network', () => {
  it('saves the admin’s factors with their sources and who set them', async () => {
    const response = await request(app)
      .put('/api/settings/network')
      .set('Cookie', await cookieFor('admin'))
      .send({
        energyTariffPerKWh: 0.18,
        currency: 'eur',
        tariffSource: 'Supply contract 2027, clause 4',
        gridEmissionFactorKgPerKWh: 0.12,
        emissionFactorSource: 'Supplier disclosure 2026',
      });

    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ currency: 'EUR', energyTariffPerKWh: 0.18, isPlaceholder: false, updatedByName: 'Spec admin' });
  });

  it('saves the safety settings every analysis uses, with their defaults at first and the stored values when left out', async () => {
    const admin = await cookieFor('admin');
    const factors = {
      energyTariffPerKWh: 0.18,
      currency: 'EUR',
      tariffSource: 'Contract',
      gridEmissionFactorKgPerKWh: 0.12,
      emissionFactorSource: 'Supplier',
    };

    const defaults = (await request(app).put('/api/settings/network').set('Cookie', admin).send(factors)).body;
    const saved = (
      await request(app)
        .put('/api/settings/network')
        .set('Cookie', admin)
        .send({ ...factors, worstCaseAmbientC: 38, fadeMarginK: 80 })
    ).body;
    const refused = await request(app)
      .put('/api/settings/network')
      .set('Cookie', admin)
      .send({ ...factors, fadeMarginK: -5 });
    const kept = (
      await request(app)
        .put('/api/settings/network')
        .set('Cookie', admin)
        .send({ ...factors, tariffSource: 'Contract 2028' })
    ).body;

    expect(defaults).toMatchObject({
      worstCaseAmbientC: 35,
      fadeMarginK: 50,
      maxRoadGradePercent: 15,
      crawlSpeedKph: 5,
      crawlDistanceM: 200,
    });
    expect(saved).toMatchObject({ worstCaseAmbientC: 38, fadeMarginK: 80 });
    expect(refused.status).toBe(400);
    expect(JSON.stringify(refused.body)).toContain('fadeMarginK');
    expect(kept).toMatchObject({ tariffSource: 'Contract 2028', worstCaseAmbientC: 38, fadeMarginK: 80, maxRoadGradePercent: 15 });
  });

  it('answers 400 naming the field and keeps the old factors when the source is missing', async () => {
    await setFactors({ energyTariffPerKWh: 0.25, gridEmissionFactorKgPerKWh: 0.4 });

    const response = await request(app)
      .put('/api/settings/network')
      .set('Cookie', await cookieFor('admin'))
      .send({ energyTariffPerKWh: 0.3, currency: 'EUR', tariffSource: '', gridEmissionFactorKgPerKWh: 0.4, emissionFactorSource: 'x' });

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body)).toContain('tariffSource');
    const settings = (
      await request(app)
        .get('/api/settings/network')
        .set('Cookie', await cookieFor('board'))
    ).body;
    expect(settings.energyTariffPerKWh).toBe(0.25);
  });
});

describe('GET /api/board/summary.pdf', () => {
  it('answers a one-page PDF', async () => {
    const profile = await aVehicleProfile(db);
    const route = await aRoute(db, { name: 'Pass road' });
    await aScenario(db, { routeId: route.id, vehicleProfileId: profile.id, inService: true });

    const response = await request(app)
      .get('/api/board/summary.pdf')
      .set('Cookie', await cookieFor('board'))
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });

    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toBe('application/pdf');
    const pdf = (response.body as Buffer).toString('latin1');
    expect(pdf.startsWith('%PDF-')).toBe(true);
    expect(pdf.match(/\/Type \/Page\b/g)).toHaveLength(1);
  });
});

describe('the board summary as printed and read (issue 10)', () => {
  it('counts accepted high and critical risks as their own figure, not as open items', async () => {
    const profile = await aVehicleProfile(db);
    const route = await aRoute(db, { name: 'Pass road' });
    const scenario = await aScenario(db, {
      routeId: route.id,
      vehicleProfileId: profile.id,
      inService: true,
      directionResults: [aDirectionResult('outbound', [aDescent({ startM: 100, endM: 2_000, risk: 'high', peakBrakeTempC: 420 })])],
    });
    await sync(scenario);
    await db.update(reviewItems).set({ state: 'accepted', acceptanceReason: 'Retarder fitted to every vehicle on the line' });

    const summary = boardSummarySchema.parse(
      (
        await request(app)
          .get('/api/board/summary')
          .set('Cookie', await cookieFor('board'))
      ).body,
    );

    expect(summary.openSafetyItems).toEqual({ elevated: 0, high: 0, critical: 0 });
    expect(summary.acceptedRisks).toEqual({ high: 1, critical: 0 });
  });

  it('lists a stretch of road once per direction, with its direction', async () => {
    const profile = await aVehicleProfile(db);
    const route = await aRoute(db, { name: 'Pass road' });
    await aScenario(db, {
      routeId: route.id,
      vehicleProfileId: profile.id,
      direction: 'round-trip',
      inService: true,
      directionResults: [
        aDirectionResult('outbound', [
          aDescent({ startM: 100, endM: 2_000, meanGradePercent: -7 }),
          aDescent({ startM: 1_500, endM: 2_600, meanGradePercent: -6.5 }),
        ]),
        aDirectionResult('inbound', [aDescent({ startM: 300, endM: 2_200, meanGradePercent: -6 })]),
      ],
    });

    const summary = boardSummarySchema.parse(
      (
        await request(app)
          .get('/api/board/summary')
          .set('Cookie', await cookieFor('board'))
      ).body,
    );

    expect(summary.steepestDescents.map((descent) => [descent.direction, descent.startM, descent.endM])).toEqual([
      ['outbound', 100, 2_000],
      ['inbound', 300, 2_200],
    ]);
  });

  it('prints one A4 page inside its margins, with placeholder factors marked beside the money and CO2 figures', async () => {
    await ensureNetworkSettings(db);
    const profile = await aVehicleProfile(db, { name: 'Highpass 12 m mountain bus with braking resistor (2025 order)' });
    for (const name of [
      'S Ski shuttle: Korvel Pass (Skarnfeld lifts) – Orren Village Green via the old customs house',
      '4 Pass line: Korvel – Korvel Pass – Orren, with the winter diversion over the upper switchbacks',
    ]) {
      const route = await aRoute(db, { name });
      const scenario = await aScenario(db, {
        routeId: route.id,
        vehicleProfileId: profile.id,
        direction: 'round-trip',
        inService: true,
        directionResults: [
          aDirectionResult('outbound', [aDescent({ startM: 100, endM: 9_400, risk: 'high', meanGradePercent: -7.4 })]),
          aDirectionResult('inbound', [aDescent({ startM: 9_400, endM: 25_300, risk: 'critical', meanGradePercent: -7.2 })]),
        ],
      });
      await sync(scenario);
    }
    await db.update(reviewItems).set({ state: 'accepted', acceptanceReason: 'Accepted for the spec' }).where(eq(reviewItems.risk, 'high'));

    const pdf = readPdfWords(await downloadPdf('/api/board/summary.pdf'));

    expect(pdf.pages).toHaveLength(1);
    expect([Math.round(pdf.pages[0]!.width), Math.round(pdf.pages[0]!.height)]).toEqual([595, 842]);
    expect(wordsOutsideMargins(pdf, MARGIN_PT)).toEqual([]);
    const text = pdf.text[0]!;
    for (const raw of RAW_VALUE_PATTERNS) expect(text).not.toMatch(raw);
    expect(text).toContain('Placeholder factor, not a real figure: an administrator has not yet set the network’s own tariff.');
    expect(text).toContain(
      'Placeholder factor, not a real figure: an administrator has not yet set the network’s own grid emission factor.',
    );
    // The note sits right under the money figure it qualifies, not in a footnote.
    const money = pdf.words.find((word) => word.text.startsWith('€'))!;
    const note = pdf.words.find((word) => word.text === 'tariff.')!;
    expect(note.yMin).toBeGreaterThan(money.yMax);
    expect(note.yMin - money.yMax).toBeLessThan(30);
    expect(text).toContain('High or critical risks accepted: 2 (2 high)');
    expect(text).toContain('Outbound, km 0.1–9.4');
    expect(text).toMatch(/Figures as of \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d/);
    for (const caution of ADVICE_CAUTIONS) expect(text).toContain(caution);
  });
});

async function downloadPdf(path: string): Promise<Buffer> {
  const response = await request(app)
    .get(path)
    .set('Cookie', await cookieFor('board'))
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });
  expect(response.status).toBe(200);
  return response.body as Buffer;
}

// Helpers

async function setFactors(factors: { energyTariffPerKWh: number; gridEmissionFactorKgPerKWh: number }) {
  const response = await request(app)
    .put('/api/settings/network')
    .set('Cookie', await cookieFor('admin'))
    .send({ ...factors, currency: 'CHF', tariffSource: 'Spec tariff', emissionFactorSource: 'Spec factor' });
  if (response.status !== 200) throw new Error(`settings: ${response.status} ${response.text}`);
}

function sync(scenario: ScenarioRow) {
  return db.transaction((tx) => syncReviewItems(tx, scenario, { computedAt: new Date(), directions: scenario.directionResults! }));
}
