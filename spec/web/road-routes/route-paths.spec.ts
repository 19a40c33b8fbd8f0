import { describe, expect, it } from 'vitest';
import { routeEditorFirstReads, routeVersionProfilePath } from '../../../web/app/road-routes/route-paths';

const ROUTE_ID = '6f1c2a43-0d5e-4b7a-9c1e-2b8f4d6a7c10';

/** Runs the editor's first reads with `route` as the route's answer; gives every address asked for, in order. */
async function firstReadsWith(route: unknown, routeId = ROUTE_ID): Promise<string[]> {
  const asked: string[] = [];
  await routeEditorFirstReads({ routeId }, async (url) => {
    asked.push(url);
    return url === `/api/routes/${routeId}` ? route : null;
  });
  return asked;
}

describe('the route editor’s first reads', () => {
  it('reads the current version’s profile once the route names its version, at the address the editor asks for', async () => {
    const asked = await firstReadsWith({ id: ROUTE_ID, version: 3 });

    expect(asked[0]).toBe(`/api/routes/${ROUTE_ID}`);
    expect(asked).toContain(`/api/routes/${ROUTE_ID}/versions`);
    expect(asked.at(-1)).toBe(`/api/routes/${ROUTE_ID}/versions/3/profile`);
    expect(routeVersionProfilePath(ROUTE_ID, 3)).toBe(`/api/routes/${ROUTE_ID}/versions/3/profile`);
  });

  it('reads no profile when the route did not come (refused, missing) and nothing for an address that is not a route id', async () => {
    const refused = await firstReadsWith(null);
    const notAnId = await firstReadsWith({ id: 'x', version: 1 }, 'new');

    expect(refused.some((url) => url.endsWith('/profile'))).toBe(false);
    expect(notAnId).toEqual([]);
  });
});
