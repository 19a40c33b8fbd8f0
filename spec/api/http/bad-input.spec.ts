import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { apiErrorSchema } from '@shared/domain/api-error';
import { createTestContext, signedInAgent } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;

beforeEach(() => truncateAll(db));
afterAll(() => context.close());

describe('bad input', () => {
  it('answers 400 in the error shape for malformed JSON', async () => {
    const response = await request(app)
      .post('/api/auth/login')
      .set('Content-Type', 'application/json')
      .send('{"email": "a@b.c", "password": ');

    expect(response.status).toBe(400);
    expect(apiErrorSchema.parse(response.body).error.message).toMatch(/not valid JSON/);
    expect(response.text).not.toMatch(/at .*\.ts/);
  });

  it('names the missing field', async () => {
    const { agent } = await signedInAgent(app, db, 'admin');
    const before = await countRows(db, 'users');

    const response = await agent.post('/api/people').send({ email: 'new@spec.example', role: 'planner' });

    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('invalid_request');
    expect(response.body.error.details.fieldErrors).toHaveProperty('name');
    expect(await countRows(db, 'users')).toBe(before);
  });

  it('names a field of the wrong type', async () => {
    const { agent } = await signedInAgent(app, db, 'admin');

    const response = await agent.post('/api/people').send({ email: 'new@spec.example', name: 42, role: 'planner' });

    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/name/);
  });

  it('refuses an unknown role and an over-long name, writing nothing', async () => {
    const { agent } = await signedInAgent(app, db, 'admin');
    const before = await countRows(db, 'users');

    const unknownRole = await agent.post('/api/people').send({ email: 'a@spec.example', name: 'A', role: 'driver' });
    const longName = await agent.post('/api/people').send({ email: 'b@spec.example', name: 'x'.repeat(500), role: 'planner' });

    expect(unknownRole.status).toBe(400);
    expect(unknownRole.body.error.details.fieldErrors).toHaveProperty('role');
    expect(longName.status).toBe(400);
    expect(longName.body.error.details.fieldErrors).toHaveProperty('name');
    expect(await countRows(db, 'users')).toBe(before);
    expect(await countRows(db, 'mail_outbox')).toBe(0);
  });

  it('refuses a malformed id in the path with 400', async () => {
    const { agent } = await signedInAgent(app, db, 'admin');

    const response = await agent.patch('/api/people/not-a-uuid').send({ role: 'board' });

    expect(response.status).toBe(400);
    expect(response.body.error.details.fieldErrors).toHaveProperty('personId');
  });

  it('answers 404 in the error shape for an unknown endpoint', async () => {
    const response = await request(app).get('/api/no-such-thing');

    expect(response.status).toBe(404);
    expect(response.body.error.code).toBe('not_found');
  });
});
