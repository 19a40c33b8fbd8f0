import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { serviceDayResultSchema, type ServiceDayDraftInput } from '@shared/domain/service-days';
import { ADVICE_CAUTIONS_TITLE } from '@shared/presentation/index';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { waitForInlineServiceDayRuns } from '../../../api/service-days/service-days-service';
import { A4_HEIGHT_PT, A4_WIDTH_PT, MARGIN_PT } from '../../../api/pdf/pdf-layout';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';
import { aRouteDraft, pointNear } from '../../support/road-route-builders';
import { RAW_VALUE_PATTERNS, readPdfWords, wordsOutsideMargins } from '../../support/pdf-words';
import { blockVehicleSentence } from '../../../shared/presentation/service-day-labels';

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

/** Two blocks on the 2 km test line: one leaves with a full battery, one with barely more than the reserve. */
function aDay(routeId: string): ServiceDayDraftInput {
  const terminus = pointNear(2_000);
  const depot = pointNear(0);
  return {
    name: 'Winter weekday, Gillsby shuttle',
    dayType: 'weekday',
    season: 'winter',
    batteryAge: 'end-of-life',
    reserveSoc: 0.15,
    chargers: [
      {
        key: 'depot',
        name: 'Brackenfold depot',
        kind: 'depot',
        position: [depot.lon, depot.lat],
        powerW: 100_000,
        efficiency: 0.92,
        targetSoc: 0.95,
      },
      {
        key: 'tarn',
        name: 'Upper Tarn terminus',
        kind: 'terminus',
        position: [terminus.lon, terminus.lat],
        powerW: 300_000,
        efficiency: 0.9,
        targetSoc: 0.9,
      },
    ],
    blocks: [
      {
        blockId: 'Shuttle 1',
        vehicleProfileId: BUS,
        depotChargerKey: 'depot',
        pullOutS: 6 * 3600,
        pullInS: 9 * 3600,
        startSoc: 0.9,
        trips: [
          { routeId, direction: 'outbound', departureS: 6 * 3600 + 600 },
          { routeId, direction: 'inbound', departureS: 7 * 3600 },
          { routeId, direction: 'outbound', departureS: 7 * 3600 + 1800 },
        ],
      },
      {
        blockId: 'Shuttle 2',
        vehicleProfileId: BUS,
        pullOutS: 7 * 3600,
        pullInS: 8 * 3600 + 1800,
        startSoc: 0.16,
        trips: [
          { routeId, direction: 'inbound', departureS: 7 * 3600 + 300, load: { kind: 'case', case: 'full-standing' } },
          { routeId, direction: 'outbound', departureS: 7 * 3600 + 2400 },
        ],
      },
    ],
  };
}

describe('the service-day report (PDF)', () => {
  it('is a 404 naming the problem before the day has been run', async () => {
    const route = await request(app)
      .post('/api/routes')
      .set('Cookie', await cookieFor('planner'))
      .send(aRouteDraft());
    const day = await request(app).post('/api/service-days').set('Cookie', analyst).send(aDay(route.body.id));

    const response = await request(app)
      .get(`/api/service-days/${day.body.id}/report.pdf`)
      .set('Cookie', await cookieFor('board'));

    expect(response.status).toBe(404);
    expect(response.body.error.message).toMatch(/not been run/);
  });

  it('says on A4 what the result says: blocks that cannot be worked first, charging, cautions, all inside the margins', async () => {
    const route = await request(app)
      .post('/api/routes')
      .set('Cookie', await cookieFor('planner'))
      .send(aRouteDraft());
    const day = await request(app).post('/api/service-days').set('Cookie', analyst).send(aDay(route.body.id));
    await request(app).post(`/api/service-days/${day.body.id}/run`).set('Cookie', analyst).expect(202);
    await waitForInlineServiceDayRuns(context.deps);
    const result = serviceDayResultSchema.parse(
      (await request(app).get(`/api/service-days/${day.body.id}/result`).set('Cookie', analyst)).body,
    );

    const response = await request(app)
      .get(`/api/service-days/${day.body.id}/report.pdf`)
      .set('Cookie', await cookieFor('board'))
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });

    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toBe('application/pdf');
    expect(response.headers['content-disposition']).toBe('attachment; filename=winter-weekday-gillsby-shuttle.pdf');
    const pdf = readPdfWords(response.body as Buffer);
    for (const page of pdf.pages) {
      expect(page.width).toBeCloseTo(A4_WIDTH_PT, 0);
      expect(page.height).toBeCloseTo(A4_HEIGHT_PT, 0);
    }
    expect(wordsOutsideMargins(pdf, MARGIN_PT).map((word) => word.text)).toEqual([]);
    for (const pattern of RAW_VALUE_PATTERNS) expect(pdf.text.join(' ')).not.toMatch(pattern);
    const text = pdf.text.join(' ');
    expect(text).toContain('Winter weekday, Gillsby shuttle');
    expect(text).toContain('End of battery life');
    const failing = result.blocks.filter((block) => !block.feasible);
    // The low-SOC block cannot be worked; the report leads with it and its reasons.
    expect(failing.map((block) => block.blockId)).toContain('Shuttle 2');
    expect(text).toContain(`${failing.length} of 2 blocks cannot be worked`);
    for (const problem of failing.flatMap((block) => block.problems)) expect(text).toContain(problem.split(' ').slice(0, 4).join(' '));
    expect(text.indexOf('Block Shuttle 2:')).toBeLessThan(text.indexOf('SOC through the day'));
    // And why, in the words the result page uses: the battery it had at that age, what the auxiliaries drew.
    const why = blockVehicleSentence(
      failing.find((block) => block.blockId === 'Shuttle 2')!,
      'end-of-life',
      'metric',
    );
    expect(why).toMatch(/^At the end of its life the battery holds \d+ kWh usable/);
    expect(text).toContain(why.split(' ').slice(0, 12).join(' '));
    expect(text).toContain('Reserve 15 %');
    for (const event of result.blocks.flatMap((block) => block.chargingEvents)) {
      expect(text).toContain(event.chargerKey === 'depot' ? 'Brackenfold depot' : 'Upper Tarn terminus');
    }
    expect(text).toContain(ADVICE_CAUTIONS_TITLE.split(' ').slice(0, 3).join(' '));
    expect(text).toContain('licensed engineer');
  });
});
