import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { describeDescentAdvice } from '@shared/presentation/descent-advice';
import { adviceCautionsText } from '@shared/presentation/advice-cautions';
import type { ScenarioRow } from '../../../api/db/schema/index';
import { syncReviewItems } from '../../../api/reviews/review-sync';
import { startMailCatcher } from '../../support/mail-catcher';
import { aDescent, aDirectionResult, aRoute, aScenario, aVehicleProfile } from '../../support/scenario-fixtures';
import { aPerson, createTestContext } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';

const context = createTestContext({ PUBLIC_URL: 'https://descentry.transit.example' });
const { app, db } = context;
let catcher: Awaited<ReturnType<typeof startMailCatcher>>;

beforeAll(async () => {
  catcher = await startMailCatcher(db);
});
beforeEach(() => truncateAll(db));
afterAll(async () => {
  await catcher.close();
  await context.close();
});

describe('e-mail to safety officers about new high-risk descents', () => {
  it('sends the route, the descent, the advice, a link and the caution to every active safety officer', async () => {
    const officer = await aPerson(db, { role: 'safety', name: 'Ines Officer' });
    const second = await aPerson(db, { role: 'safety' });
    const disabled = await aPerson(db, { role: 'safety', status: 'disabled' });
    const planner = await aPerson(db, { role: 'planner' });
    const scenario = await aScenarioWith([
      aDescent({
        startM: 1_250,
        endM: 3_480,
        dropM: 182.4,
        meanGradePercent: -8.2,
        maxGradePercent: -11.4,
        risk: 'critical',
        peakBrakeTempC: 612.3,
        maxSafeSpeedKph: 18.7,
        speedAdvice: 'limit',
        maxTopSoc: 0.55,
      }),
    ]);

    const report = await sync(scenario);
    await catcher.deliver();

    const message = await catcher.lastMessageTo(officer.email);
    expect(message?.subject).toContain('Critical-risk descent on Col road 12');
    const body = message!.textBody;
    expect(body).toContain('Route: Col road 12 (outbound)');
    expect(body).toContain('Descent: km 1.3–3.5, drop 182 m, mean grade 8.2 % down, steepest 11.4 %');
    // Rounded toward safety, as on the screen and in the PDF (issue 10): temperatures up, speeds and SOC down.
    expect(body).toContain('Risk: Critical; peak brake temperature 613 °C');
    expect(body).toContain('descend at or below 18 km/h');
    expect(body).toContain('start the descent at or below 55 % SOC');
    expect(body).toContain(
      `Advice: ${describeDescentAdvice({ speedAdvice: 'limit', maxSafeSpeedKph: 18.7, maxTopSoc: 0.55, fadeThresholdC: 0 }, 'metric').short}`,
    );
    expect(body).toContain(`https://descentry.transit.example/reviews/${report.raised[0]}`);
    expect(body).toContain(adviceCautionsText());
    expect(body).toContain('Regeneration is not a fail-safe brake');
    expect(await catcher.lastMessageTo(second.email)).toBeDefined();
    expect(await catcher.lastMessageTo(disabled.email)).toBeUndefined();
    expect(await catcher.lastMessageTo(planner.email)).toBeUndefined();
  });

  it('sends nothing for an elevated item, nor for a rerun of a known one', async () => {
    await aPerson(db, { role: 'safety' });
    const scenario = await aScenarioWith([aDescent({ startM: 100, endM: 900, risk: 'elevated', peakBrakeTempC: 320 }), aDescent()]);
    await sync(scenario);
    const queuedAfterFirstRun = await countRows(db, 'mail_outbox');

    await sync(scenario);

    expect(queuedAfterFirstRun).toBe(1);
    expect(await countRows(db, 'mail_outbox')).toBe(1);
  });

  it('respects a safety officer who switched the message off', async () => {
    const quiet = await aPerson(db, { role: 'safety' });
    const cookie = await cookieOf(quiet.id);
    await request(app).put('/api/me/notifications').set('Cookie', cookie).send({ newHighRiskDescent: false, reviewResolved: true });
    const scenario = await aScenarioWith([aDescent({ risk: 'critical', peakBrakeTempC: 600 })]);

    await sync(scenario);

    expect(await countRows(db, 'mail_outbox')).toBe(0);
  });
});

describe('e-mail to the planner when their scenario’s item is resolved', () => {
  it('tells the scenario’s creator once the risk acceptance is signed off, with both officers, the reason and the link', async () => {
    const planner = await aPerson(db, { role: 'planner', name: 'Paul Planner' });
    const reviewId = await aRaisedItemOf(planner.id);
    const safetyCookie = await cookieOf((await aPerson(db, { role: 'safety', name: 'Sara Safety' })).id);
    const secondCookie = await cookieOf((await aPerson(db, { role: 'safety', name: 'Sam Second' })).id);

    await transition(reviewId, safetyCookie, { action: 'acknowledge' });
    await transition(reviewId, safetyCookie, { action: 'accept', reason: 'Retarder fitted on every vehicle of this line' });
    await catcher.deliver();
    const beforeSignOff = await catcher.lastMessageTo(planner.email);
    await transition(reviewId, secondCookie, { action: 'sign-off' });
    await catcher.deliver();

    expect(beforeSignOff).toBeUndefined();
    const message = await catcher.lastMessageTo(planner.email);
    expect(message?.subject).toContain('Descent review risk accepted: Col road 12');
    expect(message?.textBody).toContain('Sam Second resolved a descent review item on your scenario');
    expect(message?.textBody).toContain('proposed by Sara Safety and signed off by Sam Second');
    expect(message?.textBody).toContain('Retarder fitted on every vehicle of this line');
    expect(message?.textBody).toContain(`https://descentry.transit.example/reviews/${reviewId}`);
    expect(message?.textBody).toContain(adviceCautionsText());
  });

  it('stays quiet for a planner who switched it off', async () => {
    const planner = await aPerson(db, { role: 'planner' });
    await request(app)
      .put('/api/me/notifications')
      .set('Cookie', await cookieOf(planner.id))
      .send({ newHighRiskDescent: true, reviewResolved: false });
    const reviewId = await aRaisedItemOf(planner.id);
    const safetyCookie = await cookieOf((await aPerson(db, { role: 'safety' })).id);

    await transition(reviewId, safetyCookie, { action: 'acknowledge' });
    await transition(reviewId, safetyCookie, { action: 'accept', reason: 'Midibuses only on this line from May' });
    await transition(reviewId, await cookieOf((await aPerson(db, { role: 'safety' })).id), { action: 'sign-off' });
    await catcher.deliver();

    expect(await catcher.lastMessageTo(planner.email)).toBeUndefined();
  });
});

// Helpers

async function aScenarioWith(descents: ReturnType<typeof aDescent>[], createdById: string | null = null) {
  const route = await aRoute(db, { name: 'Col road 12' });
  const profile = await aVehicleProfile(db);
  return aScenario(db, {
    routeId: route.id,
    vehicleProfileId: profile.id,
    createdById,
    directionResults: [aDirectionResult('outbound', descents)],
  });
}

function sync(scenario: ScenarioRow) {
  return db.transaction((tx) =>
    syncReviewItems(
      tx,
      scenario,
      { computedAt: new Date(), directions: scenario.directionResults! },
      { publicUrl: context.deps.config.PUBLIC_URL },
    ),
  );
}

async function aRaisedItemOf(createdById: string): Promise<string> {
  const report = await sync(await aScenarioWith([aDescent({ risk: 'elevated', peakBrakeTempC: 330 })], createdById));
  return report.raised[0]!;
}

/** A session cookie for an existing person (the helper signs them in without the login form). */
async function cookieOf(personId: string): Promise<string> {
  const { createSession } = await import('../../../api/auth/auth-repository');
  const { SESSION_COOKIE, signSessionToken } = await import('../../../api/auth/session-tokens');
  const session = await createSession(db, personId, new Date(Date.now() + 3_600_000), 'spec');
  const token = await signSessionToken(context.deps.config.SESSION_SECRET, { sessionId: session.id, userId: personId }, 60);
  return `${SESSION_COOKIE}=${token}`;
}

async function transition(reviewId: string, cookie: string, body: object) {
  const response = await request(app)
    .post(`/api/reviews/${reviewId}/transitions`)
    .set('Cookie', cookie)
    .set('Origin', 'https://descentry.transit.example')
    .send(body);
  if (response.status !== 200) throw new Error(`transition failed: ${response.status} ${response.text}`);
  return response;
}
