import { getTableName, is, sql } from 'drizzle-orm';
import { PgTable } from 'drizzle-orm/pg-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runtimeOf } from '../../../api/app-runtime';
import { UNANNOUNCED_TABLES, type AnswerCache } from '../../../api/http/answer-cache';
import * as schema from '../../../api/db/schema/index';
import { aRouteDraft } from '../../support/road-route-builders';
import { aPerson, createTestContext, TEST_PASSWORD, type TestContext } from '../../support/test-app';

/** Waits (at most 10 s) until `condition` holds; announcements from the database arrive asynchronously. */
async function until(condition: () => boolean, what: string): Promise<void> {
  const end = Date.now() + 10_000;
  while (!condition()) {
    if (Date.now() > end) throw new Error(`gave up waiting: ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

/** GET or POST on one instance as one signed-in person. */
interface Caller {
  get(path: string): request.Test;
  post(path: string): request.Test;
}

/** Signs a new person in on `signInOn`; the caller sends their cookie to `app`. */
async function signedIn(signInOn: TestContext, role: 'planner' | 'board', app = signInOn.app): Promise<Caller> {
  const person = await aPerson(signInOn.db, { role });
  const login = await request(signInOn.app).post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });
  expect(login.status).toBe(200);
  const cookie = login.headers['set-cookie']![0]!.split(';')[0]!;
  return {
    get: (path) => request(app).get(path).set('Cookie', cookie),
    post: (path) => request(app).post(path).set('Cookie', cookie),
  };
}

/** Names of the routes in the list, as the caller reads it. */
async function routeNames(agent: Caller): Promise<string[]> {
  const response = await agent.get('/api/routes').expect(200);
  return (response.body as { items: { name: string }[] }).items.map((item) => item.name);
}

/**
 * Two API processes on one database, each with its own connection pool and answer cache: a
 * change made through one, or straight in the database, must be seen by the next read on either.
 */
describe('answer cache of the list endpoints', () => {
  let first: TestContext;
  let second: TestContext;
  let firstCache: AnswerCache;
  let secondCache: AnswerCache;
  let onFirst: Caller;
  let onSecond: Caller;

  beforeAll(async () => {
    first = createTestContext();
    second = createTestContext();
    firstCache = runtimeOf(first.deps).answerCache;
    secondCache = runtimeOf(second.deps).answerCache;
    await until(() => firstCache.trusted && secondCache.trusted, 'both instances hear their own heartbeat');
    onFirst = await signedIn(first, 'planner');
    onSecond = await signedIn(first, 'planner', second.app);
    await onFirst
      .post('/api/routes')
      .send(aRouteDraft({ name: 'Quarry spur' }))
      .expect(201);
  });

  afterAll(async () => {
    await first.close();
    await second.close();
  });

  /** Reads the list until it was answered from memory (proves the answer is kept). */
  async function keptOn(agent: Caller, cache: AnswerCache) {
    await routeNames(agent);
    const hits = cache.stats.hits;
    await routeNames(agent);
    expect(cache.stats.hits).toBe(hits + 1);
  }

  it('answers a repeated read from memory with the same body, compressed as asked', async () => {
    for (let i = 1; i <= 6; i++)
      await onFirst
        .post('/api/routes')
        .send(aRouteDraft({ name: `Valley line ${i}` }))
        .expect(201);
    const fresh = await onFirst.get('/api/routes').set('Accept-Encoding', 'identity').expect(200);
    const hits = firstCache.stats.hits;

    // (supertest unpacks the gzip body and parses it, as a browser would)
    const kept = await onFirst.get('/api/routes').set('Accept-Encoding', 'gzip').expect(200);

    expect(firstCache.stats.hits).toBe(hits + 1);
    expect(fresh.text.length).toBeGreaterThan(1024);
    expect(kept.headers['content-encoding']).toBe('gzip');
    expect(kept.headers['content-type']).toBe('application/json; charset=utf-8');
    expect(kept.headers['cache-control']).toBe('no-store');
    expect(kept.body).toEqual(fresh.body);
  });

  it('shows a route created through the API on the very next read of the same instance', async () => {
    await keptOn(onFirst, firstCache);

    await onFirst
      .post('/api/routes')
      .send(aRouteDraft({ name: 'Glacier loop' }))
      .expect(201);

    expect(await routeNames(onFirst)).toContain('Glacier loop');
  });

  it('shows a change made on the other instance as soon as it is announced', async () => {
    await keptOn(onSecond, secondCache);
    const emptied = secondCache.stats.emptied;

    await onFirst
      .post('/api/routes')
      .send(aRouteDraft({ name: 'Pass shuttle' }))
      .expect(201);
    await until(() => secondCache.stats.emptied > emptied, 'the second instance hears of the new route');

    expect(await routeNames(onSecond)).toContain('Pass shuttle');
  });

  it('shows a change made straight in the database, without the API', async () => {
    await keptOn(onSecond, secondCache);
    const emptied = secondCache.stats.emptied;

    await first.db.execute(sql`update road_route_versions set name = 'Quarry spur (renamed)' where name = 'Quarry spur'`);
    await until(() => secondCache.stats.emptied > emptied, 'the second instance hears of the rename');

    const names = await routeNames(onSecond);
    expect(names).toContain('Quarry spur (renamed)');
    expect(names).not.toContain('Quarry spur');
  });

  it('keeps answers apart by address and by role, and still refuses callers without a session', async () => {
    await keptOn(onFirst, firstCache);
    const board = await signedIn(first, 'board');
    await keptOn(onFirst, firstCache);

    const misses = firstCache.stats.misses;
    await board.get('/api/routes').expect(200);
    await onFirst.get('/api/routes?q=Glacier').expect(200);
    expect(firstCache.stats.misses).toBe(misses + 2);

    await request(first.app).get('/api/routes').expect(401);
  });

  it('keeps no answer read while a write was in flight', async () => {
    await keptOn(onFirst, firstCache);
    const stored = firstCache.stats.stored;

    const [, listed] = await Promise.all([
      onFirst
        .post('/api/routes')
        .send(aRouteDraft({ name: 'Dam road' }))
        .expect(201),
      onFirst.get('/api/routes').expect(200),
    ]);
    const next = await routeNames(onFirst);

    expect(listed.status).toBe(200);
    expect(next).toContain('Dam road');
    // Whatever the order the two requests ran in, an answer kept now was read after the write ended.
    expect(firstCache.stats.stored).toBeGreaterThanOrEqual(stored);
  });

  it('answers from the database on every request while its announcement line is not proven alive', async () => {
    const third = createTestContext();
    const cache = runtimeOf(third.deps).answerCache;
    try {
      await until(() => cache.trusted, 'the third instance hears its own heartbeat');
      const agent = await signedIn(third, 'planner');
      await keptOn(agent, cache);
      cache.stop();

      // With no line, a change the cache cannot hear of must still be seen at once.
      await first.db.execute(sql`update road_route_versions set name = 'Dam road (closed)' where name = 'Dam road'`);
      const hits = cache.stats.hits;

      expect(cache.trusted).toBe(false);
      expect(await routeNames(agent)).toContain('Dam road (closed)');
      expect(cache.stats.hits).toBe(hits);
    } finally {
      await third.close();
    }
  });

  it('every table of the schema announces its changes, but the few no kept answer reads', async () => {
    const tables = (Object.values(schema) as unknown[])
      .filter((value): value is PgTable => is(value, PgTable))
      .map((table) => getTableName(table));
    const rows = await first.db.execute<{ table_name: string }>(sql`
      select c.relname as table_name from pg_trigger t join pg_class c on c.oid = t.tgrelid
      where t.tgname = c.relname || '_announce_data_change' and not t.tgisinternal`);
    const announced = new Set(rows.map((row) => row.table_name));

    const missing = tables.filter((name) => !announced.has(name) && !(UNANNOUNCED_TABLES as readonly string[]).includes(name));
    expect(tables.length).toBeGreaterThan(15);
    expect(missing).toEqual([]);
    expect(UNANNOUNCED_TABLES.filter((name) => announced.has(name))).toEqual([]);
  });
});
