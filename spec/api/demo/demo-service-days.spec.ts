import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { boardSummarySchema } from '@shared/domain/board-summary';
import { serviceDayListSchema, serviceDayResultSchema } from '@shared/domain/service-days';
import { seedDemoNetwork } from '../../../api/demo/demo-network';
import { seedDemoPeople } from '../../../api/demo/demo-people';
import { seedDemoServiceDays } from '../../../api/demo/demo-service-days';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';
import { readPdfWords, wordsOutsideMargins } from '../../support/pdf-words';
import { MARGIN_PT } from '../../../api/pdf/pdf-layout';

const context = createTestContext();
const { app, db, deps } = context;

beforeAll(async () => {
  await truncateAll(db);
  await seedDemoPeople(db);
  await seedDemoNetwork(deps);
  await seedDemoServiceDays(deps);
  await seedDemoServiceDays(deps);
}, 240_000);
afterAll(() => context.close());

describe('demo service days', () => {
  it('are loaded once and run: four in service, one end-of-life check where block P2 falls below its reserve in winter', async () => {
    expect(await countRows(db, 'service_days')).toBe(5);
    const board = await sessionCookies(db, deps.config)('board');
    const list = serviceDayListSchema.parse((await request(app).get('/api/service-days').set('Cookie', board)).body);
    expect(list.items.map((day) => [day.name, day.status, day.inService])).toEqual([
      ['Sunday and holiday, summer', 'done', true],
      ['Sunday and holiday, winter', 'done', true],
      ['Weekday, summer', 'done', true],
      ['Weekday, winter', 'done', true],
      ['Weekday, winter, batteries at end of life (check)', 'done', false],
    ]);
    const results = new Map<string, ReturnType<typeof serviceDayResultSchema.parse>>();
    for (const day of list.items) {
      results.set(
        day.name,
        serviceDayResultSchema.parse((await request(app).get(`/api/service-days/${day.id}/result`).set('Cookie', board)).body),
      );
    }
    const check = results.get('Weekday, winter, batteries at end of life (check)')!;
    expect(check.blocks.filter((block) => !block.feasible).map((block) => block.blockId)).toEqual(['P2']);
    expect(check.blocks.find((block) => block.blockId === 'P2')!.problems.join(' ')).toMatch(/reserve|15 %/);
    for (const name of ['Weekday, winter', 'Weekday, summer', 'Sunday and holiday, winter', 'Sunday and holiday, summer']) {
      expect(
        results.get(name)!.blocks.every((block) => block.feasible),
        name,
      ).toBe(true);
    }
    // Every demo vehicle models its cabin, so the winter days draw heating from the cold, the
    // passengers and the doors. P2's 2019 bus heats resistively and fails; P1's 2025 bus with its
    // CO₂ heat pump works the same line and holds.
    for (const [name, result] of results) {
      expect(
        result.blocks.every((block) => block.vehicle?.auxiliarySource === 'climate'),
        name,
      ).toBe(true);
    }
    const p1 = check.blocks.find((block) => block.blockId === 'P1')!;
    const p2 = check.blocks.find((block) => block.blockId === 'P2')!;
    console.info(
      `end-of-life winter check: P1 lowest SOC ${p1.minSoc.toFixed(3)}, heating at a stop ${p1.vehicle!.standingHeatingPowerW.toFixed(0)} W; ` +
        `P2 lowest SOC ${p2.minSoc.toFixed(3)}, heating at a stop ${p2.vehicle!.standingHeatingPowerW.toFixed(0)} W`,
    );
    expect(p2.vehicle!.standingHeatingPowerW).toBeGreaterThan(1.5 * p1.vehicle!.standingHeatingPowerW);
    expect(p2.vehicle!.usableCapacityWh).toBeCloseTo(0.8 * 350_000, 6);
    expect(p1.minSoc).toBeGreaterThanOrEqual(0.15);
    expect(p2.minSoc).toBeLessThan(0.15);
    // The terminus charger at Lindmoor tops up the Valley-line blocks.
    expect(results.get('Weekday, winter')!.blocks.find((block) => block.blockId === 'V1')!.chargingEvents.length).toBeGreaterThan(0);
    const summary = boardSummarySchema.parse((await request(app).get('/api/board/summary').set('Cookie', board)).body);
    expect(summary.annual.basis).toBe('service-days');
    expect(summary.annual.serviceDays).toHaveLength(4);
  });

  it('has its annual basis stated on the one-page board PDF, every word inside the margins', async () => {
    const board = await sessionCookies(db, deps.config)('board');
    const summary = boardSummarySchema.parse((await request(app).get('/api/board/summary').set('Cookie', board)).body);
    const response = await request(app)
      .get('/api/board/summary.pdf')
      .set('Cookie', board)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(response.status).toBe(200);
    const pdf = readPdfWords(response.body as Buffer);

    expect(pdf.pages).toHaveLength(1);
    expect(wordsOutsideMargins(pdf, MARGIN_PT)).toEqual([]);
    const text = pdf.text[0]!.replace(/\s+/g, ' ');
    expect(text).toContain('How the year is counted');
    expect(text).toContain('The year is the 4 in-service service days, each × its days a year from the network settings');
    for (const day of summary.annual.serviceDays) expect(text).toContain(`× ${day.daysPerYear}`);
    expect(text).toContain(summary.annual.baseline.name);
  });
});
