import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '@shared/domain/roles';
import { createTestContext } from '../support/test-app';
import { sessionCookies } from '../support/session-cookie';
import { truncateAll } from '../support/test-database';

/**
 * The designed access rule of every endpoint: 'public', 'signed-in' or the roles allowed.
 * Every operation in the OpenAPI document must have a row here, so a new endpoint cannot ship
 * without someone deciding who may call it.
 */
const EXPECTED_ACCESS: Record<string, 'public' | 'signed-in' | readonly Role[]> = {
  'GET /api/health': 'public',
  'POST /api/auth/login': 'public',
  'POST /api/auth/logout': 'signed-in',
  'GET /api/auth/session': 'public',
  'GET /api/auth/me': 'signed-in',
  'POST /api/auth/password': 'signed-in',
  'POST /api/auth/token-info': 'public',
  'POST /api/auth/invitations/accept': 'public',
  'POST /api/auth/password-reset/request': 'public',
  'POST /api/auth/password-reset/confirm': 'public',
  'GET /api/people': ['admin'],
  'POST /api/people': ['admin'],
  'PATCH /api/people/{personId}': ['admin'],
  'POST /api/people/{personId}/unblock-sign-in': ['admin'],
  'POST /api/people/{personId}/password-reset': ['admin'],
  'GET /api/mail/outbox': ['admin'],
  'GET /api/mail/captured': ['admin'],
  'POST /api/analysis/road-load': 'signed-in',
  'POST /api/analysis/preview': 'signed-in',
  'POST /api/terrain': ['analyst', 'admin'],
  'GET /api/terrain': 'signed-in',
  'POST /api/terrain/sample': 'signed-in',
  'GET /api/terrain/{terrainId}': 'signed-in',
  'DELETE /api/terrain/{terrainId}': ['analyst', 'admin'],
  'POST /api/terrain/{terrainId}/restore': ['analyst', 'admin'],
  'GET /api/tiles/terrain/{z}/{x}/{y}.png': 'signed-in',
  'GET /api/routes': 'signed-in',
  'POST /api/routes': ['planner'],
  'POST /api/routes/profile': 'signed-in',
  'POST /api/routes/import': ['planner'],
  'POST /api/routes/import-gtfs': ['planner'],
  'GET /api/routes/{routeId}': 'signed-in',
  'PUT /api/routes/{routeId}': ['planner'],
  'DELETE /api/routes/{routeId}': ['planner'],
  'POST /api/routes/{routeId}/restore': ['planner'],
  'GET /api/routes/{routeId}/versions': 'signed-in',
  'GET /api/routes/{routeId}/versions/{version}': 'signed-in',
  'GET /api/routes/{routeId}/versions/{version}/profile': 'signed-in',
  'GET /api/routes/{routeId}/export': 'signed-in',
  'POST /api/road-network': ['analyst'],
  'GET /api/road-network': 'signed-in',
  'POST /api/road-network/path': 'signed-in',
  'POST /api/basemap': ['analyst', 'admin'],
  'GET /api/basemap': 'signed-in',
  'GET /api/tiles/base/{z}/{x}/{y}.pbf': 'signed-in',
  'GET /api/vehicles': 'signed-in',
  'POST /api/vehicles': ['analyst'],
  'GET /api/vehicles/{vehicleProfileId}': 'signed-in',
  'PUT /api/vehicles/{vehicleProfileId}': ['analyst'],
  'DELETE /api/vehicles/{vehicleProfileId}': ['analyst'],
  'POST /api/vehicles/{vehicleProfileId}/restore': ['analyst'],
  'GET /api/vehicles/{vehicleProfileId}/capability': 'signed-in',
  'GET /api/vehicles/{vehicleProfileId}/versions': 'signed-in',
  'POST /api/vehicles/{vehicleProfileId}/logged-trips': ['analyst', 'admin'],
  'GET /api/vehicles/{vehicleProfileId}/logged-trips': 'signed-in',
  'GET /api/logged-trips/{loggedTripId}': 'signed-in',
  'GET /api/logged-trips/{loggedTripId}/comparison': 'signed-in',
  'DELETE /api/logged-trips/{loggedTripId}': ['analyst', 'admin'],
  'POST /api/vehicles/{vehicleProfileId}/calibrations': ['analyst', 'admin'],
  'GET /api/vehicles/{vehicleProfileId}/calibrations': 'signed-in',
  'GET /api/calibrations/{calibrationId}': 'signed-in',
  'POST /api/calibrations/{calibrationId}/accept': ['analyst', 'admin'],
  'POST /api/calibrations/{calibrationId}/reject': ['analyst', 'admin'],
  'GET /api/service-days': 'signed-in',
  'POST /api/service-days': ['analyst', 'admin'],
  'POST /api/service-days/gtfs-blocks': ['analyst', 'admin'],
  'POST /api/service-days/gtfs-services': ['analyst', 'admin'],
  'GET /api/service-days/{serviceDayId}': 'signed-in',
  'PUT /api/service-days/{serviceDayId}': ['analyst', 'admin'],
  'DELETE /api/service-days/{serviceDayId}': ['analyst', 'admin'],
  'POST /api/service-days/{serviceDayId}/restore': ['analyst', 'admin'],
  'POST /api/service-days/{serviceDayId}/run': ['analyst', 'admin'],
  'GET /api/service-days/{serviceDayId}/result': 'signed-in',
  'GET /api/service-days/{serviceDayId}/result.csv': 'signed-in',
  'GET /api/service-days/{serviceDayId}/report.pdf': 'signed-in',
  'GET /api/scenarios': 'signed-in',
  'POST /api/scenarios': ['planner', 'analyst'],
  'GET /api/scenarios/compare': 'signed-in',
  'GET /api/scenarios/{scenarioId}': 'signed-in',
  'PUT /api/scenarios/{scenarioId}': ['planner', 'analyst'],
  'DELETE /api/scenarios/{scenarioId}': ['planner', 'analyst'],
  'POST /api/scenarios/{scenarioId}/restore': ['planner', 'analyst'],
  'POST /api/scenarios/{scenarioId}/run': ['planner', 'analyst'],
  'GET /api/scenarios/{scenarioId}/result': 'signed-in',
  'GET /api/scenarios/{scenarioId}/export.csv': 'signed-in',
  'GET /api/scenarios/{scenarioId}/export.geojson': 'signed-in',
  'GET /api/scenarios/{scenarioId}/report.pdf': 'signed-in',
  'GET /api/scenarios/{scenarioId}/descent-cards.pdf': 'signed-in',
  'GET /api/reviews': 'signed-in',
  'GET /api/reviews/{reviewId}': 'signed-in',
  'POST /api/reviews/{reviewId}/transitions': ['safety'],
  'GET /api/reviews/{reviewId}/events': 'signed-in',
  'GET /api/me/notifications': 'signed-in',
  'PUT /api/me/notifications': 'signed-in',
  'GET /api/board/summary': 'signed-in',
  'GET /api/board/summary.pdf': 'signed-in',
  'GET /api/settings/network': 'signed-in',
  'PUT /api/settings/network': ['admin'],
  'POST /api/batch-runs': ['analyst'],
  'GET /api/batch-runs': 'signed-in',
  'GET /api/batch-runs/{batchRunId}': 'signed-in',
  'GET /api/deleted-items': ['planner', 'analyst', 'admin'],
  'GET /api/audit-log': ['admin'],
};

const context = createTestContext();
const { app, db } = context;
let operations: Array<{ key: string; method: string; path: string; documented: unknown }> = [];
let cookieFor: (role: Role) => Promise<string>;

beforeAll(async () => {
  await truncateAll(db);
  cookieFor = sessionCookies(db, context.deps.config);
  const document = (await request(app).get('/api/openapi.json')).body as {
    paths: Record<string, Record<string, { 'x-access': unknown }>>;
  };
  operations = Object.entries(document.paths).flatMap(([path, methods]) =>
    Object.entries(methods).map(([method, operation]) => ({
      key: `${method.toUpperCase()} ${path}`,
      method,
      path,
      documented: operation['x-access'],
    })),
  );
});
afterAll(() => context.close());

describe('authorization matrix', () => {
  it('has a designed access rule for every documented endpoint, and no stale rows', () => {
    const documented = operations.map((operation) => operation.key).sort();

    expect(documented).toEqual(Object.keys(EXPECTED_ACCESS).sort());
  });

  it('documents each endpoint with its designed access', () => {
    for (const operation of operations) {
      const expected = EXPECTED_ACCESS[operation.key];
      const roles = expected === 'signed-in' ? [...ROLES] : expected;
      expect(operation.documented, operation.key).toEqual(roles);
    }
  });

  it('answers anonymous callers 401 and roles outside the rule 403, and lets allowed roles through', async () => {
    const failures: string[] = [];
    for (const operation of operations) {
      const rule = EXPECTED_ACCESS[operation.key];
      if (!rule) continue;
      const url = concretePath(operation.path);
      const anonymous = await send(operation.method, url);
      if (rule !== 'public' && anonymous !== 401) failures.push(`${operation.key} anonymous → ${anonymous}, expected 401`);
      if (rule === 'public' && (anonymous === 401 || anonymous === 403)) {
        failures.push(`${operation.key} anonymous → ${anonymous}, expected it to be public`);
      }
      for (const role of ROLES) {
        const status = await send(operation.method, url, await cookieFor(role));
        const allowed = rule === 'public' || rule === 'signed-in' || rule.includes(role);
        if (allowed && (status === 401 || status === 403)) failures.push(`${operation.key} as ${role} → ${status}, expected access`);
        if (!allowed && status !== 403) failures.push(`${operation.key} as ${role} → ${status}, expected 403`);
      }
    }

    expect(failures).toEqual([]);
  });
});

// Helpers

async function send(method: string, url: string, cookie?: string): Promise<number> {
  const agent = request(app) as unknown as Record<string, (url: string) => request.Test>;
  let call = agent[method]!(url);
  if (cookie) call = call.set('Cookie', cookie);
  if (method !== 'get' && method !== 'delete') call = call.send({});
  return (await call).status;
}

/** Fills path parameters: ids with a UUID that exists nowhere, anything else with 1. */
function concretePath(path: string): string {
  return path.replace(/\{(\w+)\}/g, (_, name: string) => (/id$/i.test(name) ? '00000000-0000-4000-8000-000000000000' : '1'));
}
