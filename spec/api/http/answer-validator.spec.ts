import express, { Router } from 'express';
import request from 'supertest';
import { describe, expect, it, vi } from 'vitest';
import { BEST_BROTLI_FROM_BYTES, type KeptAnswer } from '../../../api/http/answer-cache';
import { answerEtag, identityEtag, ifNoneMatchHolds, revalidatedAnswer, serverCodeVersion } from '../../../api/http/answer-validator';
import { BuiltAnswers } from '../../../api/http/built-answers';
import { endpoint, mountEndpoint } from '../../../api/http/endpoint';
import { errorHandler } from '../../../api/http/error-handler';
import { NotFoundError } from '../../../api/http/http-error';

/** An app whose one read answers differently per role (from a header, standing in for the session), as a role-dependent field would. */
function appWithRoleDependentRead() {
  const app = express();
  app.set('etag', false);
  app.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  app.get('/thing', revalidatedAnswer(), (req, res) => {
    const role = req.get('x-role') ?? 'planner';
    if (role === 'nobody') {
      res.status(404).json({ error: { code: 'not_found', message: 'No such thing' } });
      return;
    }
    res.json({ name: 'Pass descent', ...(role === 'admin' ? { internalNote: 'admins only' } : {}) });
  });
  return app;
}

describe('revalidated answers', () => {
  it('sends the answer with a weak ETag and private, no-cache, and 304 without a body when If-None-Match names it', async () => {
    const app = appWithRoleDependentRead();

    const first = await request(app).get('/thing');
    const again = await request(app).get('/thing').set('If-None-Match', first.headers['etag']!);
    const among = await request(app).get('/thing').set('If-None-Match', `W/"other", ${first.headers['etag']}`);

    expect(first.status).toBe(200);
    expect(first.body).toEqual({ name: 'Pass descent' });
    expect(first.headers['content-type']).toBe('application/json; charset=utf-8');
    expect(first.headers['cache-control']).toBe('private, no-cache');
    expect(first.headers['etag']).toBe(answerEtag(JSON.stringify({ name: 'Pass descent' })));
    expect(first.headers['etag']).toMatch(/^W\/"[A-Za-z0-9_-]{27}"$/);
    expect(again.status).toBe(304);
    expect(again.text).toBe('');
    expect(again.headers['etag']).toBe(first.headers['etag']);
    expect(among.status).toBe(304);
  });

  it('gives another role its own answer and ETag, and never 304 for an ETag of someone else’s answer', async () => {
    const app = appWithRoleDependentRead();

    const planner = await request(app).get('/thing').set('x-role', 'planner');
    const admin = await request(app).get('/thing').set('x-role', 'admin').set('If-None-Match', planner.headers['etag']!);

    expect(admin.status).toBe(200);
    expect(admin.body).toEqual({ name: 'Pass descent', internalNote: 'admins only' });
    expect(admin.headers['etag']).not.toBe(planner.headers['etag']);
  });

  it('leaves error answers uncached and without an ETag', async () => {
    const app = appWithRoleDependentRead();

    const missing = await request(app).get('/thing').set('x-role', 'nobody').set('If-None-Match', '*');

    expect(missing.status).toBe(404);
    expect(missing.headers['etag']).toBeUndefined();
    expect(missing.headers['cache-control']).toBe('no-store');
  });

  it('compares ETags weakly and ignores an absent or unrelated If-None-Match', () => {
    const etag = answerEtag('{"a":1}');

    expect(ifNoneMatchHolds(etag.replace('W/', ''), etag)).toBe(true);
    expect(ifNoneMatchHolds('*', etag)).toBe(true);
    expect(ifNoneMatchHolds(undefined, etag)).toBe(false);
    expect(ifNoneMatchHolds(answerEtag('{"a":2}'), etag)).toBe(false);
  });

  it('refuses to mount an endpoint that is both revalidated and kept in the answer cache, or a revalidated write', () => {
    const read = {
      path: '/api/things',
      summary: 'Things',
      tag: 'Spec',
      access: 'signed-in' as const,
      responses: {},
      handler: () => undefined,
    };

    expect(() => mountEndpoint(Router(), endpoint({ ...read, method: 'get', revalidated: true, cachedAnswer: true }))).toThrow(
      /cannot be combined/,
    );
    expect(() => mountEndpoint(Router(), endpoint({ ...read, method: 'post', revalidated: true }))).toThrow(/only reads/);
    expect(() => mountEndpoint(Router(), endpoint({ ...read, method: 'get', revalidated: true }))).not.toThrow();
  });
});

/**
 * A read whose ETag comes from what it depends on: a stored item with a version (bumped by `change`),
 * shown with an extra field to admins; `built` counts how often the answer was built.
 */
function appWithIdentifiedRead(kept = new BuiltAnswers(), options: { sameForEveryRole?: boolean } = {}) {
  const item = { exists: true, version: 1, name: 'Pass descent' };
  const counts = { built: 0, identityReads: 0 };
  /** Runs while the next answer is being built (to change the item meanwhile). */
  let duringBuild: (() => void) | undefined;
  const app = express();
  app.set('etag', false);
  app.use((req, res, next) => {
    res.set('Cache-Control', 'no-store');
    const role = req.get('x-role');
    if (role) res.locals['user'] = { id: '00000000-0000-4000-8000-000000000001', email: 'a@spec.example', name: 'Spec', role };
    next();
  });
  const router = Router();
  mountEndpoint(
    router,
    endpoint({
      method: 'get',
      path: '/api/items/:id',
      summary: 'An item',
      tag: 'Spec',
      access: 'signed-in',
      revalidated: true,
      responses: {},
      answerSameForEveryRole: options.sameForEveryRole,
      answerIdentity: async () => {
        counts.identityReads += 1;
        return item.exists ? ['item', item.version] : undefined;
      },
      handler: async ({ user, res }) => {
        if (!item.exists) throw new NotFoundError('The item');
        counts.built += 1;
        const answer = { name: item.name, version: item.version, ...(user?.role === 'admin' ? { internalNote: 'admins only' } : {}) };
        duringBuild?.();
        duringBuild = undefined;
        res.json(answer);
      },
    }),
    { builtAnswers: kept },
  );
  app.use(router);
  app.use(errorHandler);
  return {
    app,
    item,
    counts,
    kept,
    change(name: string) {
      item.name = name;
      item.version += 1;
    },
    whileBuilding(action: () => void) {
      duringBuild = action;
    },
  };
}

describe('revalidated answers with an ETag from what they depend on', () => {
  it('answers 304 for the ETag of what the answer depends on without building it, and sends the kept answer to a new visit', async () => {
    const spec = appWithIdentifiedRead();

    const first = await request(spec.app).get('/api/items/1').set('x-role', 'planner');
    const repeat = await request(spec.app).get('/api/items/1').set('x-role', 'planner').set('If-None-Match', first.headers['etag']!);
    const newVisit = await request(spec.app).get('/api/items/1').set('x-role', 'planner');

    expect(first.status).toBe(200);
    expect(first.body).toEqual({ name: 'Pass descent', version: 1 });
    expect(first.headers['cache-control']).toBe('private, no-cache');
    expect(first.headers['etag']).toBe(identityEtag('/api/items/:id', 'planner', ['item', 1]));
    expect(first.headers['etag']).toMatch(/^W\/"[A-Za-z0-9_-]{27}"$/);
    expect(repeat.status).toBe(304);
    expect(repeat.text).toBe('');
    expect(repeat.headers['etag']).toBe(first.headers['etag']);
    expect(repeat.headers['cache-control']).toBe('private, no-cache');
    expect(newVisit.status).toBe(200);
    expect(newVisit.body).toEqual(first.body);
    expect(newVisit.headers['etag']).toBe(first.headers['etag']);
    // Built once: the 304 and the new visit cost the identity's lookup only.
    expect(spec.counts.built).toBe(1);
    expect(spec.kept.stats).toMatchObject({ hits: 1, stored: 1 });
  });

  it('gives a new ETag and the new answer once what the answer depends on changed', async () => {
    const spec = appWithIdentifiedRead();
    const first = await request(spec.app).get('/api/items/1').set('x-role', 'planner');

    spec.change('Pass descent, re-run');
    const after = await request(spec.app).get('/api/items/1').set('x-role', 'planner').set('If-None-Match', first.headers['etag']!);

    expect(after.status).toBe(200);
    expect(after.body).toEqual({ name: 'Pass descent, re-run', version: 2 });
    expect(after.headers['etag']).not.toBe(first.headers['etag']);
    expect(spec.counts.built).toBe(2);
  });

  it('gives each role its own ETag, so a role never gets 304 or the kept answer of another', async () => {
    const spec = appWithIdentifiedRead();

    const planner = await request(spec.app).get('/api/items/1').set('x-role', 'planner');
    const admin = await request(spec.app).get('/api/items/1').set('x-role', 'admin').set('If-None-Match', planner.headers['etag']!);
    const adminAgain = await request(spec.app).get('/api/items/1').set('x-role', 'admin').set('If-None-Match', admin.headers['etag']!);
    const plannerAgain = await request(spec.app).get('/api/items/1').set('x-role', 'planner');

    expect(admin.status).toBe(200);
    expect(admin.body).toEqual({ name: 'Pass descent', version: 1, internalNote: 'admins only' });
    expect(admin.headers['etag']).not.toBe(planner.headers['etag']);
    expect(adminAgain.status).toBe(304);
    expect(plannerAgain.body).toEqual({ name: 'Pass descent', version: 1 });
    expect(plannerAgain.headers['etag']).toBe(planner.headers['etag']);
  });

  it('shares one ETag among the roles when the endpoint shows every role the same answer', async () => {
    const spec = appWithIdentifiedRead(new BuiltAnswers(), { sameForEveryRole: true });

    const planner = await request(spec.app).get('/api/items/1').set('x-role', 'planner');
    const board = await request(spec.app).get('/api/items/1').set('x-role', 'board').set('If-None-Match', planner.headers['etag']!);

    expect(planner.headers['etag']).toBe(identityEtag('/api/items/:id', 'every role', ['item', 1]));
    expect(board.status).toBe(304);
  });

  it('neither labels nor keeps an answer when what it depends on changed while it was being built', async () => {
    const spec = appWithIdentifiedRead();
    spec.whileBuilding(() => spec.change('Changed meanwhile'));

    const raced = await request(spec.app).get('/api/items/1').set('x-role', 'planner');
    const keptAfterRace = spec.kept.size;
    const next = await request(spec.app).get('/api/items/1').set('x-role', 'planner');

    expect(raced.status).toBe(200);
    expect(raced.body).toEqual({ name: 'Pass descent', version: 1 });
    expect(raced.headers['etag']).toBeUndefined();
    expect(raced.headers['cache-control']).toBe('no-store');
    expect(keptAfterRace).toBe(0);
    expect(next.body).toEqual({ name: 'Changed meanwhile', version: 2 });
    expect(next.headers['etag']).toBe(identityEtag('/api/items/:id', 'planner', ['item', 2]));
  });

  it('answers a missing item with the handler’s error, without an ETag, and refuses callers who are not signed in before anything else', async () => {
    const spec = appWithIdentifiedRead();
    spec.item.exists = false;

    const missing = await request(spec.app).get('/api/items/1').set('x-role', 'planner').set('If-None-Match', '*');
    const anonymous = await request(spec.app).get('/api/items/1').set('If-None-Match', '*');

    expect(missing.status).toBe(404);
    expect(missing.headers['etag']).toBeUndefined();
    expect(missing.headers['cache-control']).toBe('no-store');
    expect(anonymous.status).toBe(401);
    expect(spec.counts.identityReads).toBe(1);
  });

  it('makes the ETag from the endpoint, the role, the identity and the server’s code version', () => {
    const etag = identityEtag('/api/items/:id', 'planner', ['item', 1]);

    expect(identityEtag('/api/items/:id', 'planner', ['item', 1])).toBe(etag);
    expect(identityEtag('/api/other/:id', 'planner', ['item', 1])).not.toBe(etag);
    expect(identityEtag('/api/items/:id', 'board', ['item', 1])).not.toBe(etag);
    expect(identityEtag('/api/items/:id', 'planner', ['item', '1'])).not.toBe(etag);
    // Run from the sources, each process counts as new code.
    expect(serverCodeVersion()).toMatch(/^sources-/);
  });

  it('sends a large kept answer at a quick brotli quality first and at the best one, made in the background, to later visits', async () => {
    const spec = appWithIdentifiedRead();
    // A profile-like series: numbers along a smooth line, as a stored result's are.
    spec.item.name = Array.from({ length: 12_000 }, (_, i) => (700 + Math.sin(i / 50) * 120 + ((i * 7919) % 13) / 10).toFixed(2)).join(',');
    // supertest decodes the body; Content-Length is the size on the wire.
    const visit = () => request(spec.app).get('/api/items/1').set('x-role', 'planner').set('Accept-Encoding', 'br');
    const wireBytes = (response: { headers: Record<string, string> }) => Number(response.headers['content-length']);

    const first = await visit();
    expect(first.headers['content-encoding']).toBe('br');
    expect(JSON.stringify(first.body).length).toBeGreaterThan(BEST_BROTLI_FROM_BYTES);
    let later = first;
    await vi.waitFor(
      async () => {
        later = await visit();
        expect(wireBytes(later)).toBeLessThan(0.8 * wireBytes(first));
      },
      { timeout: 10_000, interval: 50 },
    );

    expect(later.headers['content-encoding']).toBe('br');
    expect(later.body).toEqual(first.body);
    expect(later.body).toEqual({ name: spec.item.name, version: 1 });
    expect(later.headers['etag']).toBe(first.headers['etag']);
    expect(spec.counts.built).toBe(1);
  });

  it('sends a kept answer as brotli to a browser that lists gzip first without weights, and as the client rates it otherwise', async () => {
    const spec = appWithIdentifiedRead();
    spec.item.name = 'Pass descent, '.repeat(200);
    const visit = (acceptEncoding: string) =>
      request(spec.app).get('/api/items/1').set('x-role', 'planner').set('Accept-Encoding', acceptEncoding).expect(200);

    // What Chromium and Firefox send.
    const browser = await visit('gzip, deflate, br, zstd');
    expect(browser.headers['content-encoding']).toBe('br');
    expect(browser.body).toEqual({ name: spec.item.name, version: 1 });
    expect((await visit('gzip;q=1, br;q=0.5')).headers['content-encoding']).toBe('gzip');
    expect((await visit('gzip, deflate')).headers['content-encoding']).toBe('gzip');
    expect((await visit('identity')).headers['content-encoding']).toBeUndefined();
    expect(spec.counts.built).toBe(1);
  });

  it('counts a compressed copy made later only while the same answer is kept', () => {
    const kept = new BuiltAnswers(10_000);
    const answer: KeptAnswer = { json: Buffer.alloc(1_000) };
    kept.set('a', answer);
    const before = 1_000;
    answer.br = Buffer.alloc(9_500);
    kept.grew('a', before, answer);
    // 10 500 bytes kept in a room of 10 000: the answer leaves.
    expect(kept.get('a')).toBeUndefined();

    const replaced: KeptAnswer = { json: Buffer.alloc(1_000) };
    kept.set('b', { json: Buffer.alloc(1_000) });
    replaced.br = Buffer.alloc(9_500);
    kept.grew('b', before, replaced);
    expect(kept.get('b')).toBeDefined();
  });

  it('keeps built answers within its room, dropping the least recently used first', () => {
    const kept = new BuiltAnswers(4_000);
    const answer = (n: number) => ({ json: Buffer.alloc(900, n) });
    kept.set('a', answer(1));
    kept.set('b', answer(2));
    kept.set('c', answer(3));
    kept.get('a');
    kept.set('d', answer(4));
    kept.set('e', answer(5));
    kept.set('too large', { json: Buffer.alloc(1_500) });

    expect(kept.get('b')).toBeUndefined();
    expect(kept.get('a')?.json[0]).toBe(1);
    expect(kept.get('e')?.json[0]).toBe(5);
    expect(kept.get('too large')).toBeUndefined();
    expect(kept.size).toBe(4);
  });

  it('refuses an answer identity on an endpoint that is not revalidated', () => {
    const definition = endpoint({
      method: 'get',
      path: '/api/things',
      summary: 'Things',
      tag: 'Spec',
      access: 'signed-in',
      responses: {},
      answerIdentity: async () => ['thing'],
      handler: () => undefined,
    });

    expect(() => mountEndpoint(Router(), definition)).toThrow(/mark it revalidated/);
  });
});
