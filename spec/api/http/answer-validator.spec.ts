import express, { Router } from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { answerEtag, ifNoneMatchHolds, revalidatedAnswer } from '../../../api/http/answer-validator';
import { endpoint, mountEndpoint } from '../../../api/http/endpoint';

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
