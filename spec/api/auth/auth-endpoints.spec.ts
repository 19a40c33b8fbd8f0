import { eq } from 'drizzle-orm';
import { SignJWT } from 'jose';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { ACCOUNT_RESET_POLICY, ACCOUNT_SIGN_IN_POLICY, ADDRESS_SIGN_IN_POLICY, delayAfterS } from '../../../api/auth/attempt-throttle';
import { SESSION_COOKIE } from '../../../api/auth/session-tokens';
import { attemptThrottles, mailOutbox, sessions } from '../../../api/db/schema/index';
import { TEST_PASSWORD, aPerson, createTestContext, signedInAgent } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;

beforeEach(() => truncateAll(db));
afterAll(() => context.close());

describe('POST /api/auth/login', () => {
  it('answers the person and sets an HttpOnly, SameSite=Strict session cookie', async () => {
    const person = await aPerson(db, { role: 'analyst' });

    const response = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    expect(response.status).toBe(200);
    expect(response.body).toEqual({ user: { id: person.id, email: person.email, name: person.name, role: 'analyst' } });
    const cookie = sessionCookie(response);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
  });

  it('accepts the e-mail in any letter case', async () => {
    const person = await aPerson(db, { email: 'mixed.case@spec.example' });

    const response = await request(app).post('/api/auth/login').send({ email: 'Mixed.Case@Spec.Example', password: TEST_PASSWORD });

    expect(response.status).toBe(200);
    expect(response.body.user.id).toBe(person.id);
  });

  it('answers 401 in the error shape for a wrong password and for an unknown e-mail alike', async () => {
    const person = await aPerson(db);

    const wrongPassword = await request(app).post('/api/auth/login').send({ email: person.email, password: 'not-the-password' });
    const unknown = await request(app).post('/api/auth/login').send({ email: 'nobody@spec.example', password: 'whatever' });

    expect(wrongPassword.status).toBe(401);
    expect(wrongPassword.body.error.code).toBe('invalid_credentials');
    expect(unknown.status).toBe(401);
    expect(unknown.body.error.message).toBe(wrongPassword.body.error.message);
    expect(sessionCookie(wrongPassword)).toBeUndefined();
  });

  it('refuses a disabled account even with the right password', async () => {
    const person = await aPerson(db, { status: 'disabled' });

    const response = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    expect(response.status).toBe(401);
  });

  it('answers 429 with Retry-After once an account has too many failures, even for the right password', async () => {
    const person = await aPerson(db);
    for (let attempt = 0; attempt < ACCOUNT_SIGN_IN_POLICY.freeAttempts; attempt += 1) {
      const failure = await request(app).post('/api/auth/login').send({ email: person.email, password: 'wrong-password' });
      expect(failure.status).toBe(401);
    }

    const blocked = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('too_many_attempts');
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(blocked.headers['retry-after'])).toBeLessThanOrEqual(15 * 60);
  });

  it('limits failures per address across different accounts', async () => {
    for (let attempt = 0; attempt < ADDRESS_SIGN_IN_POLICY.freeAttempts; attempt += 1) {
      await request(app)
        .post('/api/auth/login')
        .send({ email: `spray-${attempt}@spec.example`, password: 'guess' });
    }
    const person = await aPerson(db);

    const blocked = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    expect(blocked.status).toBe(429);
  });

  it('checks at most the free attempts when twenty wrong passwords arrive at once (issue 11)', async () => {
    const person = await aPerson(db);

    const responses = await Promise.all(
      Array.from({ length: 20 }, () => request(app).post('/api/auth/login').send({ email: person.email, password: 'parallel-guess' })),
    );

    const statuses = responses.map((response) => response.status);
    expect(statuses.filter((status) => status === 401)).toHaveLength(ACCOUNT_SIGN_IN_POLICY.freeAttempts);
    expect(statuses.filter((status) => status === 429)).toHaveLength(20 - ACCOUNT_SIGN_IN_POLICY.freeAttempts);
  });

  it('slows each further guess down twice as long, up to a ceiling, instead of locking the account', () => {
    const waits = [5, 6, 7, 8, 20].map((attempts) => delayAfterS(attempts, ACCOUNT_SIGN_IN_POLICY));

    expect(waits).toEqual([30, 60, 120, 240, 15 * 60]);
    expect(delayAfterS(4, ACCOUNT_SIGN_IN_POLICY)).toBe(0);
  });

  it('lets the owner sign in from a browser that signed in before while guesses from elsewhere are slowed (issue 11)', async () => {
    const person = await aPerson(db);
    const owner = request.agent(app);
    expect((await owner.post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD })).status).toBe(200);
    await owner.post('/api/auth/logout');
    for (let attempt = 0; attempt < ACCOUNT_SIGN_IN_POLICY.freeAttempts; attempt += 1) {
      await request(app)
        .post('/api/auth/login')
        .set('X-Forwarded-For', '203.0.113.9')
        .send({ email: person.email, password: 'attacker-guess' });
    }

    const attacker = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });
    const ownerAgain = await owner.post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    expect(attacker.status).toBe(429);
    expect(ownerAgain.status).toBe(200);
  });

  it('ignores X-Forwarded-For unless TRUST_PROXY names the proxy, so the address limit cannot be dodged (issue 11)', async () => {
    for (let attempt = 0; attempt < ADDRESS_SIGN_IN_POLICY.freeAttempts; attempt += 1) {
      await request(app)
        .post('/api/auth/login')
        .set('X-Forwarded-For', `198.51.100.${attempt}`)
        .send({ email: `dodge-${attempt}@spec.example`, password: 'guess' });
    }

    const next = await request(app)
      .post('/api/auth/login')
      .set('X-Forwarded-For', '198.51.100.250')
      .send({ email: 'dodge-last@spec.example', password: 'guess' });

    expect(next.status).toBe(429);
    const rows = await db.select().from(attemptThrottles);
    expect(rows.filter((row) => row.key.startsWith('address:')).map((row) => row.key)).toEqual([
      expect.stringMatching(/^address:(::ffff:)?127\.0\.0\.1$|^address:::1$/),
    ]);
  });

  it('takes the client address from X-Forwarded-For when TRUST_PROXY names the proxy', async () => {
    const proxied = createTestContext({ TRUST_PROXY: 'loopback' });

    await request(proxied.app)
      .post('/api/auth/login')
      .set('X-Forwarded-For', '192.0.2.44')
      .send({ email: 'behind@spec.example', password: 'guess' });

    const rows = await db.select().from(attemptThrottles);
    expect(rows.map((row) => row.key)).toContain('address:192.0.2.44');
    await proxied.close();
  });
});

describe('POST /api/auth/password-reset/request', () => {
  it('queues a few e-mails, not fifty, when fifty requests for one person arrive at once (issue 11)', async () => {
    const person = await aPerson(db);

    const responses = await Promise.all(
      Array.from({ length: 50 }, () => request(app).post('/api/auth/password-reset/request').send({ email: person.email })),
    );

    const queued = await db.select().from(mailOutbox);
    expect(queued).toHaveLength(ACCOUNT_RESET_POLICY.freeAttempts);
    expect(responses.filter((response) => response.status === 202)).toHaveLength(ACCOUNT_RESET_POLICY.freeAttempts);
    const refused = responses.find((response) => response.status === 429)!;
    expect(refused.body.error.code).toBe('too_many_reset_requests');
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('answers an unknown address exactly as a known one, throttled alike', async () => {
    const person = await aPerson(db);
    const send = (email: string) => request(app).post('/api/auth/password-reset/request').send({ email });

    const known = [];
    const unknown = [];
    for (let i = 0; i <= ACCOUNT_RESET_POLICY.freeAttempts; i++) {
      known.push((await send(person.email)).status);
      unknown.push((await send('nobody-here@spec.example')).status);
    }

    expect(unknown).toEqual(known);
  });
});

describe('session cookie', () => {
  it('is refused after sign-out, even when replayed', async () => {
    const { agent } = await signedInAgent(app, db, 'planner');
    const cookie = await currentCookie(agent);

    expect((await agent.post('/api/auth/logout')).status).toBe(204);

    const replay = await request(app).get('/api/auth/me').set('Cookie', cookie);
    expect(replay.status).toBe(401);
  });

  it('is refused when expired', async () => {
    const { agent, person } = await signedInAgent(app, db, 'planner');
    const session = await db.query.sessions.findFirst({ where: eq(sessions.userId, person.id) });
    const expired = await signWith(context.deps.config.SESSION_SECRET, session!.id, person.id, -60);

    const response = await request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${expired}`);

    expect(response.status).toBe(401);
    expect((await agent.get('/api/auth/me')).status).toBe(200);
  });

  it('is refused when its signature is tampered with or signed with another secret', async () => {
    const { agent, person } = await signedInAgent(app, db, 'planner');
    const token = (await currentCookie(agent)).split('=')[1]!;
    const [header, payload, signature] = token.split('.');
    const tampered = `${header}.${payload}.${signature!.slice(0, -2)}${signature!.endsWith('AA') ? 'BB' : 'AA'}`;
    const session = await db.query.sessions.findFirst({ where: eq(sessions.userId, person.id) });
    const foreign = await signWith('another-secret-another-secret-another-1', session!.id, person.id, 600);

    expect((await request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${tampered}`)).status).toBe(401);
    expect((await request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${foreign}`)).status).toBe(401);
  });

  it('is refused everywhere once the password changes', async () => {
    const { agent: first, person } = await signedInAgent(app, db, 'analyst');
    const second = request.agent(app);
    await second.post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    const change = await first
      .post('/api/auth/password')
      .send({ currentPassword: TEST_PASSWORD, newPassword: 'a-brand-new-long-password' });

    expect(change.status).toBe(204);
    expect((await first.get('/api/auth/me')).status).toBe(401);
    expect((await second.get('/api/auth/me')).status).toBe(401);
    const again = await request(app).post('/api/auth/login').send({ email: person.email, password: 'a-brand-new-long-password' });
    expect(again.status).toBe(200);
  });

  it('refuses a password change with the wrong current password or a weak new one', async () => {
    const { agent } = await signedInAgent(app, db, 'analyst');

    const wrong = await agent.post('/api/auth/password').send({ currentPassword: 'nope', newPassword: 'a-brand-new-long-password' });
    const weak = await agent.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'short' });

    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('wrong_password');
    expect(weak.status).toBe(400);
    expect(weak.body.error.message).toMatch(/newPassword/);
    expect((await agent.get('/api/auth/me')).status).toBe(200);
  });

  it('refuses a cross-site write even with a valid cookie', async () => {
    const { agent } = await signedInAgent(app, db, 'admin');

    const response = await agent
      .post('/api/people')
      .set('Origin', 'https://elsewhere.example')
      .send({ email: 'x@spec.example', name: 'X', role: 'planner' });

    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe('cross_origin');
  });
});

describe('GET /api/auth/me', () => {
  it('answers 401 when not signed in', async () => {
    const response = await request(app).get('/api/auth/me');

    expect(response.status).toBe(401);
    expect(response.body.error.code).toBe('unauthenticated');
  });
});

// Helpers

function sessionCookie(response: request.Response): string | undefined {
  const cookies = response.headers['set-cookie'] as unknown as string[] | undefined;
  return cookies?.find((cookie) => cookie.startsWith(`${SESSION_COOKIE}=`));
}

async function currentCookie(agent: ReturnType<typeof request.agent>): Promise<string> {
  const me = await agent.get('/api/auth/me');
  expect(me.status).toBe(200);
  const jar = (agent as unknown as { jar: { getCookie: (name: string, access: object) => { value: string } | undefined } }).jar;
  const cookie = jar.getCookie(SESSION_COOKIE, { domain: '127.0.0.1', path: '/', secure: false, script: false });
  if (!cookie) throw new Error('no session cookie in the agent');
  return `${SESSION_COOKIE}=${cookie.value}`;
}

function signWith(secret: string, sessionId: string, userId: string, expiresInS: number) {
  const nowS = Math.floor(Date.now() / 1000);
  return new SignJWT({})
    .setProtectedHeader({ alg: 'HS256' })
    .setSubject(userId)
    .setJti(sessionId)
    .setIssuer('descentry')
    .setAudience('descentry-web')
    .setIssuedAt(nowS - 3600)
    .setExpirationTime(nowS + expiresInS)
    .sign(new TextEncoder().encode(secret));
}

describe('GET /api/auth/session', () => {
  it('answers 200 with a null person when nobody is signed in (issue 10: no failed request before sign-in)', async () => {
    const response = await request(app).get('/api/auth/session');

    expect(response.status).toBe(200);
    expect(response.body).toEqual({ user: null });
  });

  it('answers the signed-in person when the session is live', async () => {
    const { agent, person } = await signedInAgent(app, db, 'safety');

    const response = await agent.get('/api/auth/session');

    expect(response.status).toBe(200);
    expect(response.body).toEqual({ user: { id: person.id, email: person.email, name: person.name, role: 'safety' } });
  });

  it('answers a null person once the session has ended', async () => {
    const { agent } = await signedInAgent(app, db, 'planner');
    await agent.post('/api/auth/logout');

    const response = await agent.get('/api/auth/session');

    expect(response.status).toBe(200);
    expect(response.body.user).toBeNull();
  });
});
