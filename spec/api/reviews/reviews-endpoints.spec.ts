import { sql } from 'drizzle-orm';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import { reviewDetailSchema, reviewListSchema } from '@shared/domain/reviews';
import type { ScenarioRow } from '../../../api/db/schema/index';
import { syncReviewItems } from '../../../api/reviews/review-sync';
import { aDescent, aDirectionResult, aRoute, aScenario, aVehicleProfile } from '../../support/scenario-fixtures';
import { createTestContext, signedInAgent } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;

beforeEach(() => truncateAll(db));
afterAll(() => context.close());

describe('review items from stored scenario results', () => {
  it('raises one item per descent at elevated risk or worse, none for low', async () => {
    const { scenario } = await aScenarioWith([
      aDescent({ startM: 100, endM: 600, risk: 'low', peakBrakeTempC: 150 }),
      aDescent({ startM: 1_000, endM: 2_000, risk: 'high' }),
      aDescent({ startM: 2_100, endM: 2_290, risk: 'elevated', peakBrakeTempC: 320 }),
    ]);

    await sync(scenario);

    const { agent } = await signedInAgent(app, db, 'board');
    const response = await agent.get('/api/reviews');
    expect(response.status).toBe(200);
    const list = reviewListSchema.parse(response.body);
    expect(list.items.map((item) => [item.risk, item.state, item.startM])).toEqual([
      ['high', 'raised', 1_000],
      ['elevated', 'raised', 2_100],
    ]);
    expect(list.caution).toBe(ENGINEERING_CAUTION);
  });

  it('filters by risk, state, route and vehicle profile', async () => {
    const { scenario, route, profile } = await aScenarioWith([
      aDescent({ startM: 1_000, endM: 2_000, risk: 'high' }),
      aDescent({ startM: 2_100, endM: 2_290, risk: 'elevated', peakBrakeTempC: 320 }),
    ]);
    await sync(scenario);
    const other = await aScenarioWith([aDescent({ risk: 'critical', peakBrakeTempC: 600 })], { routeName: 'Valley link' });
    await sync(other.scenario);
    const { agent } = await signedInAgent(app, db, 'planner');

    const byRisk = await agent.get('/api/reviews').query({ risk: 'elevated' });
    const byRoute = await agent.get('/api/reviews').query({ routeId: route.id });
    const byProfile = await agent.get('/api/reviews').query({ vehicleProfileId: profile.id, risk: 'high' });
    const byState = await agent.get('/api/reviews').query({ state: 'accepted' });

    expect(byRisk.body.items.map((item: { routeName: string }) => item.routeName)).toEqual(['Pass road 7']);
    expect(byRoute.body.items).toHaveLength(2);
    expect(byProfile.body.items).toHaveLength(1);
    expect(byState.body.items).toEqual([]);
  });

  it('answers 400 naming the field for a bad filter', async () => {
    const { agent } = await signedInAgent(app, db, 'safety');

    const response = await agent.get('/api/reviews').query({ risk: 'extreme' });

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body)).toContain('risk');
  });

  it('keeps one item across reruns whose stretch moved a little, and raises a new one for a new stretch', async () => {
    const { scenario } = await aScenarioWith([aDescent({ startM: 1_000, endM: 2_000, risk: 'high', peakBrakeTempC: 480 })]);
    await sync(scenario);

    await sync(scenario, [aDescent({ startM: 1_040, endM: 1_980, risk: 'high', peakBrakeTempC: 470 })]);
    await sync(scenario, [
      aDescent({ startM: 980, endM: 2_030, risk: 'high', peakBrakeTempC: 475 }),
      aDescent({ startM: 2_100, endM: 2_290, risk: 'elevated', peakBrakeTempC: 330 }),
    ]);

    const items = await listItems();
    expect(items).toHaveLength(2);
    expect(items[0]).toMatchObject({ startM: 980, endM: 2_030, peakBrakeTempC: 475, state: 'raised' });
  });

  it('keeps one item when another scenario of the same route, direction and vehicle sees the stretch, showing the worst', async () => {
    const { scenario, route, profile } = await aScenarioWith([aDescent({ risk: 'elevated', peakBrakeTempC: 340 })]);
    await sync(scenario);
    const harsher = await aScenario(db, {
      routeId: route.id,
      vehicleProfileId: profile.id,
      name: 'Summer, full standing',
      directionResults: [aDirectionResult('outbound', [aDescent({ startM: 1_050, risk: 'critical', peakBrakeTempC: 610 })])],
    });

    await sync(harsher);
    await sync(scenario);

    const items = await listItems();
    expect(items).toHaveLength(1);
    expect(items[0]).toMatchObject({ risk: 'critical', scenarioName: 'Summer, full standing', raisedRisk: 'elevated' });
  });

  it('keeps inbound and outbound descents of one stretch apart', async () => {
    const { scenario } = await aScenarioWith([], {
      direction: 'round-trip',
      directionResults: [aDirectionResult('outbound', [aDescent()]), aDirectionResult('inbound', [aDescent()])],
    });

    await sync(scenario);

    expect((await listItems()).map((item) => item.direction).sort()).toEqual(['inbound', 'outbound']);
  });
});

describe('reopening after a worse rerun', () => {
  it('reopens an accepted item when a rerun raises the risk', async () => {
    const { scenario, reviewId } = await anAcceptedItem(aDescent({ risk: 'elevated', peakBrakeTempC: 330 }));

    await sync(scenario, [aDescent({ risk: 'high', peakBrakeTempC: 470 })]);

    const { agent } = await signedInAgent(app, db, 'safety');
    const item = (await agent.get(`/api/reviews/${reviewId}`)).body.item;
    expect(item).toMatchObject({ state: 'reopened', risk: 'high', raisedRisk: 'elevated' });
    const events = (await agent.get(`/api/reviews/${reviewId}/events`)).body.items;
    expect(events.at(-1)).toMatchObject({
      fromState: 'accepted',
      toState: 'reopened',
      details: { previousRisk: 'elevated', risk: 'high' },
    });
  });

  it('reopens when the peak temperature rises beyond the margin at the same risk, and not within it', async () => {
    const { scenario, reviewId } = await anAcceptedItem(aDescent({ risk: 'high', peakBrakeTempC: 470 }));

    await sync(scenario, [aDescent({ risk: 'high', peakBrakeTempC: 478 })]);
    const stillAccepted = await stateOf(reviewId);
    await sync(scenario, [aDescent({ risk: 'high', peakBrakeTempC: 495 })]);

    expect(stillAccepted).toBe('accepted');
    expect(await stateOf(reviewId)).toBe('reopened');
  });

  it('reopens an acceptance still waiting for its sign-off when a rerun makes the descent worse, so nobody signs off old figures', async () => {
    const { scenario } = await aScenarioWith([aDescent({ risk: 'elevated', peakBrakeTempC: 330 })]);
    await sync(scenario);
    const reviewId = (await listItems())[0]!.id;
    const { agent } = await signedInAgent(app, db, 'safety');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'accept', reason: 'Drivers trained for this descent' });

    await sync(scenario, [aDescent({ risk: 'critical', peakBrakeTempC: 610 })]);

    expect(await stateOf(reviewId)).toBe('reopened');
    const second = await signedInAgent(app, db, 'safety');
    const signOff = await second.agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'sign-off' });
    expect(signOff.status).toBe(409);
  });

  it('leaves a resolved item alone when a rerun is milder', async () => {
    const { scenario, reviewId } = await anAcceptedItem(aDescent({ risk: 'high', peakBrakeTempC: 470 }));

    await sync(scenario, [aDescent({ risk: 'elevated', peakBrakeTempC: 320 })]);

    expect(await stateOf(reviewId)).toBe('accepted');
  });
});

describe('POST /api/reviews/:reviewId/transitions', () => {
  it('lets a safety officer acknowledge and propose acceptance, and a second one sign it off, writing one event per move', async () => {
    const reviewId = await aRaisedItem();
    const { agent, person } = await signedInAgent(app, db, 'safety');
    const second = await signedInAgent(app, db, 'safety');

    const acknowledged = await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge', note: 'Looking at it' });
    const proposed = await agent
      .post(`/api/reviews/${reviewId}/transitions`)
      .send({ action: 'accept', reason: 'Retarder fitted on every vehicle of this line' });
    const signedOff = await second.agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'sign-off' });

    expect(acknowledged.status).toBe(200);
    expect(acknowledged.body.item.state).toBe('in-review');
    expect(proposed.status).toBe(200);
    expect(proposed.body.item).toMatchObject({
      state: 'awaiting-sign-off',
      acceptanceReason: 'Retarder fitted on every vehicle of this line',
      acceptanceProposedByName: person.name,
      acceptanceSignedOffByName: null,
    });
    expect(signedOff.status).toBe(200);
    expect(signedOff.body.item).toMatchObject({
      state: 'accepted',
      acceptanceReason: 'Retarder fitted on every vehicle of this line',
      acceptanceProposedByName: person.name,
      acceptanceSignedOffByName: second.person.name,
    });
    expect(signedOff.body.caution).toBe(ENGINEERING_CAUTION);
    const events = (await agent.get(`/api/reviews/${reviewId}/events`)).body.items;
    expect(events.map((event: { fromState: string | null; toState: string }) => [event.fromState, event.toState])).toEqual([
      [null, 'raised'],
      ['raised', 'in-review'],
      ['in-review', 'awaiting-sign-off'],
      ['awaiting-sign-off', 'accepted'],
    ]);
    expect(events[1]).toMatchObject({ actorName: person.name, note: 'Looking at it' });
    expect(events[3]).toMatchObject({
      actorName: second.person.name,
      details: { proposedBy: person.name, signedOffBy: second.person.name },
    });
  });

  it('answers 403 when the safety officer who proposed an acceptance signs it off, and keeps it waiting', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'accept', reason: 'Drivers trained for this descent' });

    const response = await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'sign-off' });

    expect(response.status).toBe(403);
    expect(response.body.error).toMatchObject({ code: 'second_officer_required' });
    expect(response.body.error.message).toMatch(/second safety officer/);
    expect(await stateOf(reviewId)).toBe('awaiting-sign-off');
    expect(await countRows(db, 'review_events')).toBe(3);
  });

  it('sends a proposed acceptance back to review when a second safety officer declines it', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    const second = await signedInAgent(app, db, 'safety');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'accept', reason: 'Drivers trained for this descent' });

    const response = await second.agent
      .post(`/api/reviews/${reviewId}/transitions`)
      .send({ action: 'decline', note: 'Training alone does not keep the brakes cool' });

    expect(response.status).toBe(200);
    expect(response.body.item).toMatchObject({ state: 'in-review', acceptanceReason: null, acceptanceProposedByName: null });
  });

  it('counts a proposed acceptance as open on the board until it is signed off, then as an accepted risk', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    const second = await signedInAgent(app, db, 'safety');
    const { agent: board } = await signedInAgent(app, db, 'board');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'accept', reason: 'Drivers trained for this descent' });

    const waiting = (await board.get('/api/board/summary')).body;
    await second.agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'sign-off' });
    const signed = (await board.get('/api/board/summary')).body;

    expect(waiting.openSafetyItems).toEqual({ elevated: 0, high: 1, critical: 0 });
    expect(waiting.acceptedRisks).toEqual({ high: 0, critical: 0 });
    expect(signed.openSafetyItems).toEqual({ elevated: 0, high: 0, critical: 0 });
    expect(signed.acceptedRisks).toEqual({ high: 1, critical: 0 });
  });

  it('writes every review decision to the audit log with the move, the states and the current risk', async () => {
    const reviewId = await aRaisedItem();
    const { agent, person } = await signedInAgent(app, db, 'safety');
    const { agent: admin } = await signedInAgent(app, db, 'admin');

    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'accept', reason: 'Drivers trained for this descent' });

    const log = await admin.get('/api/audit-log').query({ kind: 'review-item', entityId: reviewId });
    expect(log.status).toBe(200);
    expect(log.body.items.map((entry: { action: string; details: { move: string } }) => [entry.action, entry.details.move])).toEqual([
      ['review-decision', 'accept'],
      ['review-decision', 'acknowledge'],
    ]);
    expect(log.body.items[0]).toMatchObject({
      actor: { name: person.name },
      entityName: expect.stringContaining('Pass road 7'),
      details: { fromState: 'in-review', toState: 'awaiting-sign-off', risk: 'high', note: 'Drivers trained for this descent' },
    });
  });

  it.each(['planner', 'analyst', 'board', 'admin'] as const)('answers 403 to a %s and changes nothing', async (role) => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, role);

    const response = await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });

    expect(response.status).toBe(403);
    expect(await stateOf(reviewId)).toBe('raised');
    expect(await countRows(db, 'review_events')).toBe(1);
  });

  it('answers 409 naming the current state for a move the workflow does not allow', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');

    const response = await agent
      .post(`/api/reviews/${reviewId}/transitions`)
      .send({ action: 'accept', reason: 'Good enough for the winter timetable' });

    expect(response.status).toBe(409);
    expect(response.body.error.message).toContain('raised');
    expect(response.body.error.details).toMatchObject({ currentState: 'raised' });
    expect(await countRows(db, 'review_events')).toBe(1);
  });

  it('answers 400 naming the reason when it is shorter than 10 characters', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });

    const response = await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'accept', reason: 'ok' });

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body.error)).toContain('reason');
    expect(await stateOf(reviewId)).toBe('in-review');
  });

  it('answers 400 for a mitigation without any measure', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });

    const response = await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'mitigate', mitigation: {} });

    expect(response.status).toBe(400);
    expect(await stateOf(reviewId)).toBe('in-review');
  });

  it('answers 422 for a mitigation with only measures the model does not represent, pointing to risk acceptance', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });

    const response = await agent
      .post(`/api/reviews/${reviewId}/transitions`)
      .send({ action: 'mitigate', mitigation: { vehicleRestriction: 'No articulated buses', mandatoryRetarder: true } });

    expect(response.status).toBe(422);
    expect(response.body.error.code).toBe('measure_not_modelled');
    expect(response.body.error.message).toMatch(/accepting the risk/);
    expect(await stateOf(reviewId)).toBe('in-review');
    expect(await countRows(db, 'review_events')).toBe(2);
  });

  it('answers 400 when a mitigation asks to be recorded without a re-run', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });

    const response = await agent
      .post(`/api/reviews/${reviewId}/transitions`)
      .send({ action: 'mitigate', mitigation: { descentSpeedCapKph: 20 }, rerun: false });

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body.error)).toContain('re-run');
    expect(await stateOf(reviewId)).toBe('in-review');
  });

  it('lets a safety officer reopen a resolved item with a note', async () => {
    const { reviewId } = await anAcceptedItem(aDescent());
    const { agent } = await signedInAgent(app, db, 'safety');

    const response = await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'reopen', note: 'New timetable adds trips' });

    expect(response.status).toBe(200);
    expect(response.body.item.state).toBe('reopened');
  });

  it('answers 404 for an unknown item', async () => {
    const { agent } = await signedInAgent(app, db, 'safety');

    const response = await agent.post('/api/reviews/00000000-0000-4000-8000-000000000000/transitions').send({ action: 'acknowledge' });

    expect(response.status).toBe(404);
  });
});

describe('the audit trail', () => {
  it('offers no endpoint that changes or deletes an event', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'safety');
    const [event] = (await agent.get(`/api/reviews/${reviewId}/events`)).body.items;

    const put = await agent.put(`/api/reviews/${reviewId}/events/${event.id}`).send({ note: 'rewritten' });
    const del = await agent.delete(`/api/reviews/${reviewId}/events/${event.id}`);
    const delAll = await agent.delete(`/api/reviews/${reviewId}/events`);

    expect([put.status, del.status, delAll.status]).toEqual([404, 404, 404]);
    expect(await countRows(db, 'review_events')).toBe(1);
  });

  it('is refused by the database on UPDATE and DELETE', async () => {
    await aRaisedItem();

    const update = await databaseError(db.execute(sql`update review_events set note = 'rewritten'`));
    const remove = await databaseError(db.execute(sql`delete from review_events`));

    expect(update).toMatch(/append-only: UPDATE/);
    expect(remove).toMatch(/append-only: DELETE/);

    const [row] = await db.execute<{ note: string }>(sql`select note from review_events`);
    expect(row?.note).toMatch(/^Raised by a run/);
  });
});

describe('GET /api/reviews/:reviewId', () => {
  it('returns the descent’s profile slice, route line and stored assessment with the caution', async () => {
    const reviewId = await aRaisedItem();
    const { agent } = await signedInAgent(app, db, 'board');

    const response = await agent.get(`/api/reviews/${reviewId}`);

    expect(response.status).toBe(200);
    const detail = reviewDetailSchema.parse(response.body);
    expect(detail.profile?.distanceM).toEqual([1_000, 1_100, 1_200, 1_300, 1_400, 1_500, 1_600, 1_700, 1_800, 1_900, 2_000]);
    expect(detail.profile?.brakeTempC).toHaveLength(11);
    expect(detail.geometry?.coordinates).toHaveLength(11);
    expect(detail.caution).toBe(ENGINEERING_CAUTION);
    expect(detail.descent).toMatchObject({ startM: detail.item.startM, endM: detail.item.endM, risk: detail.item.risk });
  });

  it('answers 400 naming reviewId for a malformed id', async () => {
    const { agent } = await signedInAgent(app, db, 'board');

    const response = await agent.get('/api/reviews/not-a-uuid');

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body)).toContain('reviewId');
  });
});

describe('/api/me/notifications', () => {
  it('starts with both switches on and saves a change', async () => {
    const { agent } = await signedInAgent(app, db, 'safety');

    const before = await agent.get('/api/me/notifications');
    const saved = await agent.put('/api/me/notifications').send({ newHighRiskDescent: false, reviewResolved: true });
    const after = await agent.get('/api/me/notifications');

    expect(before.body).toEqual({ newHighRiskDescent: true, reviewResolved: true });
    expect(saved.status).toBe(200);
    expect(after.body).toEqual({ newHighRiskDescent: false, reviewResolved: true });
  });

  it('answers 400 naming the field for a non-boolean switch', async () => {
    const { agent } = await signedInAgent(app, db, 'planner');

    const response = await agent.put('/api/me/notifications').send({ reviewResolved: 'sometimes' });

    expect(response.status).toBe(400);
    expect(JSON.stringify(response.body)).toContain('reviewResolved');
  });
});

// Helpers

async function aScenarioWith(
  descents: ReturnType<typeof aDescent>[],
  options: {
    routeName?: string;
    direction?: 'outbound' | 'round-trip';
    directionResults?: ReturnType<typeof aDirectionResult>[];
    createdById?: string;
  } = {},
) {
  const route = await aRoute(db, { name: options.routeName });
  const profile = await aVehicleProfile(db);
  const scenario = await aScenario(db, {
    routeId: route.id,
    vehicleProfileId: profile.id,
    direction: options.direction,
    createdById: options.createdById,
    directionResults: options.directionResults ?? [aDirectionResult('outbound', descents)],
  });
  return { route, profile, scenario };
}

/** Syncs the scenario's stored result, or a rerun's descents for its outbound direction. */
async function sync(scenario: ScenarioRow, outboundDescents?: ReturnType<typeof aDescent>[]) {
  const directions = outboundDescents ? [aDirectionResult('outbound', outboundDescents)] : scenario.directionResults!;
  await db.transaction((tx) => syncReviewItems(tx, scenario, { computedAt: new Date(), directions }));
}

async function listItems() {
  const { agent } = await signedInAgent(app, db, 'board');
  return reviewListSchema.parse((await agent.get('/api/reviews')).body).items;
}

async function aRaisedItem(): Promise<string> {
  const { scenario } = await aScenarioWith([aDescent()]);
  await sync(scenario);
  return (await listItems())[0]!.id;
}

async function anAcceptedItem(descent: ReturnType<typeof aDescent>) {
  const { scenario } = await aScenarioWith([descent]);
  await sync(scenario);
  const reviewId = (await listItems())[0]!.id;
  const { agent } = await signedInAgent(app, db, 'safety');
  await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'acknowledge' });
  await agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'accept', reason: 'Drivers trained for this descent' });
  const second = await signedInAgent(app, db, 'safety');
  await second.agent.post(`/api/reviews/${reviewId}/transitions`).send({ action: 'sign-off' });
  return { scenario, reviewId };
}

/** The database's own message of a failed query (drizzle wraps it as the cause). */
async function databaseError(query: Promise<unknown>): Promise<string> {
  const error = await query.then(
    () => new Error('the query succeeded'),
    (failure: unknown) => failure as Error & { cause?: Error },
  );
  return (error as Error & { cause?: Error }).cause?.message ?? error.message;
}

async function stateOf(reviewId: string) {
  const [row] = await db.execute<{ state: string }>(sql`select state from review_items where id = ${reviewId}`);
  return row?.state;
}
