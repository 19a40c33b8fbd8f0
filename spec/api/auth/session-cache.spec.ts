import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runtimeOf } from '../../../api/app-runtime';
import type { SessionCache } from '../../../api/auth/session-cache';
import { sessions } from '../../../api/db/schema/index';
import { aPerson, createTestContext, TEST_PASSWORD, type TestContext } from '../../support/test-app';

/** Waits (at most 10 s) until `condition` holds; the session cache learns of changes asynchronously. */
async function until(condition: () => boolean, what: string): Promise<void> {
  const end = Date.now() + 10_000;
  while (!condition()) {
    if (Date.now() > end) throw new Error(`gave up waiting: ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

/**
 * Two API processes on one database, each with its own connection pool and session cache: a
 * change made through one (or straight in the database) must reach the other's cache.
 */
describe('session cache across two API instances', () => {
  let first: TestContext;
  let second: TestContext;
  let secondCache: SessionCache;

  beforeAll(async () => {
    first = createTestContext();
    second = createTestContext();
    secondCache = runtimeOf(second.deps).sessionCache;
    await until(() => secondCache.trusted, 'the second instance hears its own heartbeat');
  });

  afterAll(async () => {
    await first.close();
    await second.close();
  });

  /** Signs a new person in on the first instance; returns their cookie and a lookup on the second. */
  async function signedInOnFirst(role: 'planner' | 'admin' = 'planner') {
    const person = await aPerson(first.db, { role });
    const login = await request(first.app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });
    expect(login.status).toBe(200);
    const cookie = login.headers['set-cookie']![0]!.split(';')[0]!;
    const meOnSecond = () => request(second.app).get('/api/auth/me').set('Cookie', cookie);
    return { person, cookie, meOnSecond };
  }

  /** Asks the second instance until its cache answered from memory (proves the entry is cached). */
  async function cachedOnSecond(meOnSecond: () => request.Test) {
    expect((await meOnSecond()).status).toBe(200);
    const hits = secondCache.stats.hits;
    expect((await meOnSecond()).status).toBe(200);
    expect(secondCache.stats.hits).toBe(hits + 1);
  }

  it('answers a known session from memory without losing who it is', async () => {
    const { person, meOnSecond } = await signedInOnFirst();

    await cachedOnSecond(meOnSecond);
    const response = await meOnSecond();

    expect(response.body.user).toEqual({ id: person.id, email: person.email, name: person.name, role: 'planner' });
  });

  it('ends the session on the other instance when the person signs out', async () => {
    const { cookie, meOnSecond } = await signedInOnFirst();
    await cachedOnSecond(meOnSecond);
    const forgotten = secondCache.stats.forgotten;

    const logout = await request(first.app).post('/api/auth/logout').set('Cookie', cookie);
    await until(() => secondCache.stats.forgotten > forgotten, 'the second instance hears of the sign-out');

    expect(logout.status).toBe(204);
    expect((await meOnSecond()).status).toBe(401);
  });

  it('ends the session on the other instance when the person changes their password', async () => {
    const { cookie, meOnSecond } = await signedInOnFirst();
    await cachedOnSecond(meOnSecond);
    const forgotten = secondCache.stats.forgotten;

    const change = await request(first.app)
      .post('/api/auth/password')
      .set('Cookie', cookie)
      .send({ currentPassword: TEST_PASSWORD, newPassword: 'a-new-and-long-enough-passphrase-17' });
    await until(() => secondCache.stats.forgotten > forgotten, 'the second instance hears of the password change');

    expect(change.status).toBe(204);
    expect((await meOnSecond()).status).toBe(401);
  });

  it('ends the session on the other instance when an administrator changes the role or disables the account', async () => {
    const admin = await signedInOnFirst('admin');
    for (const update of [{ role: 'analyst' }, { status: 'disabled' }]) {
      const { person, meOnSecond } = await signedInOnFirst();
      await cachedOnSecond(meOnSecond);
      const forgotten = secondCache.stats.forgotten;

      const patch = await request(first.app).patch(`/api/people/${person.id}`).set('Cookie', admin.cookie).send(update);
      await until(() => secondCache.stats.forgotten > forgotten, 'the second instance hears of the change');

      expect(patch.status, JSON.stringify(update)).toBe(200);
      expect((await meOnSecond()).status, JSON.stringify(update)).toBe(401);
    }
  });

  it('shows a renamed person under the new name on the other instance', async () => {
    const admin = await signedInOnFirst('admin');
    const { person, meOnSecond } = await signedInOnFirst();
    await cachedOnSecond(meOnSecond);
    const forgotten = secondCache.stats.forgotten;

    await request(first.app).patch(`/api/people/${person.id}`).set('Cookie', admin.cookie).send({ name: 'Renamed Planner' }).expect(200);
    await until(() => secondCache.stats.forgotten > forgotten, 'the second instance hears of the rename');

    const response = await meOnSecond();
    expect(response.status).toBe(200);
    expect(response.body.user.name).toBe('Renamed Planner');
  });

  it('ends the session when it is revoked straight in the database, without the API', async () => {
    const { meOnSecond, person } = await signedInOnFirst();
    await cachedOnSecond(meOnSecond);
    const forgotten = secondCache.stats.forgotten;

    await first.db.update(sessions).set({ revokedAt: new Date() }).where(eq(sessions.userId, person.id));
    await until(() => secondCache.stats.forgotten > forgotten, 'the second instance hears of the revocation');

    expect((await meOnSecond()).status).toBe(401);
  });

  it('ends the session when the account is deleted straight in the database', async () => {
    const { meOnSecond, person } = await signedInOnFirst();
    await cachedOnSecond(meOnSecond);
    const forgotten = secondCache.stats.forgotten;

    await first.db.execute(sql`delete from sessions where user_id = ${person.id}`);
    await until(() => secondCache.stats.forgotten > forgotten, 'the second instance hears of the deletion');

    expect((await meOnSecond()).status).toBe(401);
  });

  it('asks the database on every request while its announcement line is not proven alive', async () => {
    const third = createTestContext();
    const cache = runtimeOf(third.deps).sessionCache;
    try {
      await until(() => cache.trusted, 'the third instance hears its own heartbeat');
      const { cookie, person } = await signedInOnFirst();
      const me = () => request(third.app).get('/api/auth/me').set('Cookie', cookie);
      await me().expect(200);
      cache.stop();

      // With no line, a change the cache cannot hear of must still be seen at once.
      await first.db.update(sessions).set({ revokedAt: new Date() }).where(eq(sessions.userId, person.id));
      const hits = cache.stats.hits;

      expect(cache.trusted).toBe(false);
      expect((await me()).status).toBe(401);
      expect(cache.stats.hits).toBe(hits);
    } finally {
      await third.close();
    }
  });
});
