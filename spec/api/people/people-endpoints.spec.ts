import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ACCOUNT_SIGN_IN_POLICY } from '../../../api/auth/attempt-throttle';
import { TEST_PASSWORD, aPerson, createTestContext, signedInAgent } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';
import { startMailCatcher, tokenFromLink } from '../../support/mail-catcher';

const context = createTestContext();
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

describe('invitation, end to end through the mail catcher', () => {
  it('lets the invited person set a password once and sign in with the chosen role', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');

    const invited = await admin.post('/api/people').send({ email: 'Hanna.Ost@spec.example', name: 'Hanna Ost', role: 'safety' });
    expect(invited.status).toBe(201);
    expect(invited.body).toMatchObject({ email: 'hanna.ost@spec.example', role: 'safety', status: 'invited' });
    expect(await catcher.deliver()).toBe(1);
    const message = await catcher.lastMessageTo('hanna.ost@spec.example');
    expect(message?.subject).toBe('You are invited to Descentry');
    const token = tokenFromLink(message!.textBody);

    const info = await request(app).post('/api/auth/token-info').send({ token });
    expect(info.body).toEqual({ kind: 'invite', email: 'hanna.ost@spec.example', name: 'Hanna Ost' });
    const accepted = await request(app).post('/api/auth/invitations/accept').send({ token, password: 'valley-floor-at-dawn' });
    expect(accepted.status).toBe(204);
    const again = await request(app).post('/api/auth/invitations/accept').send({ token, password: 'another-long-password' });
    expect(again.status).toBe(410);
    const login = await request(app).post('/api/auth/login').send({ email: 'hanna.ost@spec.example', password: 'valley-floor-at-dawn' });
    expect(login.status).toBe(200);
    expect(login.body.user.role).toBe('safety');
  });

  it('refuses a weak password on the invitation page and keeps the link usable', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    await admin.post('/api/people').send({ email: 'weak@spec.example', name: 'Weak', role: 'board' });
    await catcher.deliver();
    const token = tokenFromLink((await catcher.lastMessageTo('weak@spec.example'))!.textBody);

    const weak = await request(app).post('/api/auth/invitations/accept').send({ token, password: 'short' });
    const strong = await request(app).post('/api/auth/invitations/accept').send({ token, password: 'a-much-longer-password' });

    expect(weak.status).toBe(400);
    expect(weak.body.error.message).toMatch(/password/);
    expect(strong.status).toBe(204);
  });

  it('answers 409 and adds nobody when the e-mail already has an account', async () => {
    const { agent: admin, person } = await signedInAgent(app, db, 'admin');
    const before = await countRows(db, 'users');

    const response = await admin.post('/api/people').send({ email: person.email.toUpperCase(), name: 'Dup', role: 'planner' });

    expect(response.status).toBe(409);
    expect(await countRows(db, 'users')).toBe(before);
    expect(await countRows(db, 'mail_outbox')).toBe(0);
  });
});

describe('password reset, end to end through the mail catcher', () => {
  it('sets a new password through the link and ends old sessions', async () => {
    const { agent, person } = await signedInAgent(app, db, 'planner');

    const asked = await request(app).post('/api/auth/password-reset/request').send({ email: person.email });
    expect(asked.status).toBe(202);
    await catcher.deliver();
    const message = await catcher.lastMessageTo(person.email);
    expect(message?.subject).toBe('Reset your Descentry password');
    const token = tokenFromLink(message!.textBody);
    const confirmed = await request(app).post('/api/auth/password-reset/confirm').send({ token, password: 'fresh-snow-on-the-pass' });

    expect(confirmed.status).toBe(204);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
    expect((await request(app).post('/api/auth/login').send({ email: person.email, password: 'fresh-snow-on-the-pass' })).status).toBe(200);
  });

  it('answers 202 for an unknown e-mail without sending anything', async () => {
    const response = await request(app).post('/api/auth/password-reset/request').send({ email: 'ghost@spec.example' });

    expect(response.status).toBe(202);
    expect(await countRows(db, 'mail_outbox')).toBe(0);
  });

  it('refuses an expired link', async () => {
    const { person } = await signedInAgent(app, db, 'planner');
    await request(app).post('/api/auth/password-reset/request').send({ email: person.email });
    await db.execute(sql`update account_tokens set expires_at = now() - interval '1 minute'`);
    await catcher.deliver();
    const token = tokenFromLink((await catcher.lastMessageTo(person.email))!.textBody);

    const response = await request(app).post('/api/auth/password-reset/confirm').send({ token, password: 'fresh-snow-on-the-pass' });

    expect(response.status).toBe(410);
    expect(response.body.error.code).toBe('expired_token');
  });

  it('refuses an invitation link on the reset endpoint', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    await admin.post('/api/people').send({ email: 'mixup@spec.example', name: 'Mix', role: 'planner' });
    await catcher.deliver();
    const token = tokenFromLink((await catcher.lastMessageTo('mixup@spec.example'))!.textBody);

    const response = await request(app).post('/api/auth/password-reset/confirm').send({ token, password: 'fresh-snow-on-the-pass' });

    expect(response.status).toBe(404);
  });
});

describe('PATCH /api/people/:personId', () => {
  it('changes a role and ends that person’s sessions', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    const { agent: planner, person } = await signedInAgent(app, db, 'planner');

    const response = await admin.patch(`/api/people/${person.id}`).send({ role: 'analyst' });

    expect(response.status).toBe(200);
    expect(response.body.role).toBe('analyst');
    expect((await planner.get('/api/auth/me')).status).toBe(401);
  });

  it('disables an account so it can no longer sign in', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    const { agent: board, person } = await signedInAgent(app, db, 'board');

    const response = await admin.patch(`/api/people/${person.id}`).send({ status: 'disabled' });

    expect(response.body.status).toBe('disabled');
    expect((await board.get('/api/auth/me')).status).toBe(401);
  });

  it('refuses to let an admin disable their own account', async () => {
    const { agent: admin, person } = await signedInAgent(app, db, 'admin');

    const response = await admin.patch(`/api/people/${person.id}`).send({ status: 'disabled' });

    expect(response.status).toBe(409);
    expect((await admin.get('/api/auth/me')).status).toBe(200);
  });

  it('answers 404 for an unknown person and 400 for an empty change', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');

    const unknown = await admin.patch('/api/people/00000000-0000-4000-8000-000000000000').send({ role: 'board' });
    const empty = await admin.patch('/api/people/00000000-0000-4000-8000-000000000000').send({});

    expect(unknown.status).toBe(404);
    expect(empty.status).toBe(400);
  });

  it('answers 201 to one and 409 to the other of two simultaneous invitations for one address (issue 11)', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    const invite = () => admin.post('/api/people').send({ email: 'twice@spec.example', name: 'Twice', role: 'planner' });

    const [first, second] = await Promise.all([invite(), invite()]);

    expect([first.status, second.status].sort()).toEqual([201, 409]);
    expect([first, second].find((response) => response.status === 409)!.body.error.code).toBe('email_taken');
    expect(await countRows(db, 'users')).toBe(2);
  });
});

describe('sign-in slow-down as the administrator sees it (issue 11)', () => {
  it('shows an account slowed by failed sign-ins and lets the administrator lift it', async () => {
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    const person = await aPerson(db, { role: 'planner' });
    for (let attempt = 0; attempt < ACCOUNT_SIGN_IN_POLICY.freeAttempts; attempt += 1) {
      await request(app).post('/api/auth/login').send({ email: person.email, password: 'wrong-guess' });
    }
    const slowed = (await admin.get('/api/people')).body.items.find((item: { id: string }) => item.id === person.id);
    const refused = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    const lifted = await admin.post(`/api/people/${person.id}/unblock-sign-in`);
    const signedIn = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    expect(slowed.signIn.failedAttempts).toBe(ACCOUNT_SIGN_IN_POLICY.freeAttempts);
    expect(Date.parse(slowed.signIn.slowedUntil)).toBeGreaterThan(Date.now());
    expect(refused.status).toBe(429);
    expect(lifted.status).toBe(200);
    expect(lifted.body.signIn).toEqual({ failedAttempts: 0, slowedUntil: null });
    expect(signedIn.status).toBe(200);
  });

  it('shows no slow-down for accounts nobody has guessed at', async () => {
    const { agent: admin, person } = await signedInAgent(app, db, 'admin');

    const listed = (await admin.get('/api/people')).body.items.find((item: { id: string }) => item.id === person.id);

    expect(listed.signIn).toEqual({ failedAttempts: 0, slowedUntil: null });
  });
});
