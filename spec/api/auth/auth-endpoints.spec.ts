import { eq } from 'drizzle-orm';
import { SignJWT } from 'jose';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { MAX_FAILURES_PER_ACCOUNT } from '../../../api/auth/auth-service';
import { SESSION_COOKIE } from '../../../api/auth/session-tokens';
import { loginFailures, sessions } from '../../../api/db/schema/index';
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
    for (let attempt = 0; attempt < MAX_FAILURES_PER_ACCOUNT; attempt += 1) {
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
    await request(app).post('/api/auth/login').send({ email: 'spray-first@spec.example', password: 'guess' });
    const [first] = await db.select().from(loginFailures);
    await db.insert(loginFailures).values(
      Array.from({ length: 29 }, (_, index) => ({ email: `spray-${index}@spec.example`, ip: first!.ip })),
    );
    const person = await aPerson(db);

    const blocked = await request(app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });

    expect(blocked.status).toBe(429);
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

    const change = await first.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'a-brand-new-long-password' });

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
