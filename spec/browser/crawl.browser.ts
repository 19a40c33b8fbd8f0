/**
 * Every page the Angular router defines, opened as each of the five demo roles against the
 * production build served by the real server, at a desktop width (1400 px) and a phone width
 * (390 px). A page fails on any console error, uncaught exception, API answer of 4xx/5xx, or text
 * that does not fit (see findOverflowingText). Ids are the demo's own.
 *
 * The list of addresses is checked against the router's route files, so a page added to the
 * router without a place here fails this test until it is crawled too.
 */
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Page } from 'playwright-core';
import { BASE_URL, assertServerIsUp, openBrowser, screenshot, type BrowserSession } from './support/browser';
import { signInAs, signOut, type DemoRole } from './support/demo-people';
import { PageWatch, findOverflowingText } from './support/page-watch';

const ROLES: DemoRole[] = ['planner', 'analyst', 'safety', 'board', 'admin'];
const WIDE = { width: 1400, height: 900 };
const NARROW = { width: 390, height: 844 };

/** Router path (as written in the route files, joined with its parents) → an address to open. */
type Ids = Record<
  | 'routeId'
  | 'reviewId'
  | 'batchRunId'
  | 'scenarioId'
  | 'vehicleProfileId'
  | 'tripVehicleId'
  | 'loggedTripId'
  | 'calibrationId'
  | 'serviceDayId',
  string
>;
const SIGNED_IN_PAGES: Record<string, (ids: Ids) => string> = {
  '': () => '/',
  routes: () => '/routes',
  'routes/new': () => '/routes/new',
  'routes/:routeId': (ids) => `/routes/${ids.routeId}`,
  reviews: () => '/reviews',
  'reviews/:reviewId': (ids) => `/reviews/${ids.reviewId}`,
  board: () => '/board',
  'batch-runs': () => '/batch-runs',
  'batch-runs/:batchRunId': (ids) => `/batch-runs/${ids.batchRunId}`,
  scenarios: () => '/scenarios',
  'scenarios/compare': () => '/scenarios/compare',
  'scenarios/new': () => '/scenarios/new',
  'scenarios/:scenarioId/edit': (ids) => `/scenarios/${ids.scenarioId}/edit`,
  'scenarios/:scenarioId': (ids) => `/scenarios/${ids.scenarioId}`,
  'service-days': () => '/service-days',
  'service-days/new': () => '/service-days/new',
  'service-days/:serviceDayId/edit': (ids) => `/service-days/${ids.serviceDayId}/edit`,
  'service-days/:serviceDayId': (ids) => `/service-days/${ids.serviceDayId}`,
  vehicles: () => '/vehicles',
  'vehicles/new': () => '/vehicles/new',
  'vehicles/:vehicleProfileId': (ids) => `/vehicles/${ids.vehicleProfileId}`,
  'vehicles/:vehicleProfileId/logged-trips': (ids) => `/vehicles/${ids.tripVehicleId}/logged-trips`,
  'vehicles/:vehicleProfileId/logged-trips/:loggedTripId': (ids) => `/vehicles/${ids.tripVehicleId}/logged-trips/${ids.loggedTripId}`,
  'vehicles/:vehicleProfileId/calibrations/:calibrationId': (ids) => `/vehicles/${ids.tripVehicleId}/calibrations/${ids.calibrationId}`,
  terrain: () => '/terrain',
  'base-map': () => '/base-map',
  deleted: () => '/deleted',
  'admin/people': () => '/admin/people',
  'admin/mail': () => '/admin/mail',
  'admin/audit': () => '/admin/audit',
  'admin/network': () => '/admin/network',
  '**': () => '/no-such-page',
};
const PUBLIC_PAGES = ['sign-in', 'forgot-password', 'accept-invite', 'reset-password'];

describe('every page as every role', () => {
  let ids: Ids;

  before(async () => {
    await assertServerIsUp();
    ids = await demoIds();
  });

  it('knows every route the Angular router defines', () => {
    const defined = routerPaths();

    assert.deepEqual(
      [...defined].sort(),
      [...Object.keys(SIGNED_IN_PAGES), ...PUBLIC_PAGES, '**'].filter((path, index, all) => all.indexOf(path) === index).sort(),
    );
  });

  it('shows every public page cleanly before anyone signs in, including the session check', async () => {
    const browser = await openBrowser(WIDE);
    const watch = new PageWatch(browser.page);
    try {
      const problems: string[] = [];
      for (const path of ['/', ...PUBLIC_PAGES.map((page) => `/${page}`), '/accept-invite?token=not-a-real-token']) {
        await browser.page.setViewportSize(WIDE);
        problems.push(...(await visit(browser.page, watch, path, WIDE.width, true)));
        await browser.page.setViewportSize(NARROW);
        problems.push(...(await settle(browser.page, watch)));
        problems.push(...(await check(browser.page, watch, path, NARROW.width)));
      }
      assert.deepEqual(problems, []);
    } finally {
      watch.stop();
      await browser.close();
    }
  });

  for (const role of ROLES) {
    describe(`as ${role}`, () => {
      let browser: BrowserSession;
      let watch: PageWatch;

      before(async () => {
        browser = await openBrowser(WIDE);
        await signInAs(browser.page, role);
        watch = new PageWatch(browser.page);
      });
      after(async () => {
        watch?.stop();
        if (browser) await signOut(browser.page).catch(() => undefined);
        await browser?.close();
      });

      it('opens every page without errors and with all text readable at 1400 px and 390 px', async () => {
        const problems: string[] = [];
        for (const [routerPath, address] of Object.entries(SIGNED_IN_PAGES)) {
          const path = address(ids);
          await browser.page.setViewportSize(WIDE);
          problems.push(...(await visit(browser.page, watch, path, WIDE.width)));
          await browser.page.setViewportSize(NARROW);
          problems.push(...(await settle(browser.page, watch)));
          problems.push(...(await check(browser.page, watch, path, NARROW.width)));
          if (routerPath === 'board' || routerPath === 'scenarios/:scenarioId' || routerPath === 'service-days/:serviceDayId') {
            await screenshot(browser.page, `crawl-${role}-${routerPath.replace(/[/:]/g, '-')}-390`);
          }
        }
        assert.deepEqual(problems, []);
      });
    });
  }
});

/**
 * Answers a page asks for and handles itself: an invitation link with a made-up token is told
 * by the server that the token is not valid, and the page says so.
 */
const EXPECTED_ANSWERS: Record<string, string[]> = {
  '/accept-invite?token=not-a-real-token': ['POST /api/auth/token-info 400'],
};

/** Opens `path`: a full load the first time, then in-app navigation (as a person clicking links). */
async function visit(page: Page, watch: PageWatch, path: string, width: number, fullLoad = false): Promise<string[]> {
  if (fullLoad) {
    await page.goto(`${BASE_URL}${path}`, { waitUntil: 'load' });
  } else {
    await page.evaluate((target) => {
      history.pushState(null, '', target);
      dispatchEvent(new PopStateEvent('popstate', { state: null }));
    }, path);
  }
  const unsettled = await settle(page, watch);
  return [...unsettled, ...(await check(page, watch, path, width))];
}

async function check(page: Page, watch: PageWatch, path: string, width: number): Promise<string[]> {
  const where = `${path} at ${width} px`;
  const expected = EXPECTED_ANSWERS[path] ?? [];
  const seen = watch
    .take()
    .filter((problem) => !(problem.kind === 'failed request' && expected.includes(problem.detail)))
    // Chromium logs every 4xx as "Failed to load resource"; an expected answer is not an error.
    .filter(
      (problem) =>
        !(
          problem.kind === 'console error' &&
          /^Failed to load resource/.test(problem.detail) &&
          expected.some((answer) => problem.detail.includes(answer.split(' ')[1]!))
        ),
    )
    .map((problem) => `${where}: ${problem.kind}: ${problem.detail}`);
  let overflowing = await findOverflowingText(page);
  if (overflowing.length > 0) {
    // A layout can still be settling a frame after a resize or a navigation (fonts, a chart
    // redrawing): look again once after a moment; what still does not fit then is a defect.
    await page.waitForTimeout(600);
    overflowing = await findOverflowingText(page);
  }
  const overflow = overflowing.map((problem) => `${where}: text "${problem.text}" in ${problem.where}: ${problem.how}`);
  return [...seen, ...overflow];
}

/**
 * Waits until the page has loaded what it shows: no request in flight, no progress bar, no
 * transition running. A page that never gets there is a problem in itself (an endless spinner).
 */
async function settle(page: Page, watch: PageWatch): Promise<string[]> {
  try {
    await watch.idle();
    await page
      .locator('mat-progress-bar[mode="indeterminate"], mat-progress-bar[mode="query"]')
      .first()
      .waitFor({ state: 'hidden', timeout: 8_000 });
    await page.waitForFunction(
      () =>
        document
          .getAnimations()
          .every((animation) => animation.playState !== 'running' || animation.effect?.getTiming().iterations === Infinity),
      undefined,
      { timeout: 5_000 },
    );
    // Charts redraw a moment after the window changes width; wait until each fits its box again.
    await page.waitForFunction(
      () =>
        [...document.querySelectorAll('canvas')]
          .filter((canvas) => !canvas.closest('.leaflet-container'))
          .every((canvas) => canvas.getBoundingClientRect().width <= (canvas.parentElement?.getBoundingClientRect().width ?? 0) + 1),
      undefined,
      { timeout: 5_000 },
    );
    return [];
  } catch (error: unknown) {
    // Expected only when the page never finishes loading: report it and go on to the next page.
    return [`${new URL(page.url()).pathname}: never finished loading (${String(error).split('\n')[0]})`];
  }
}

/** Real ids from the demo, read through the API as the analyst (who may read all of them). */
async function demoIds(): Promise<Ids> {
  const browser = await openBrowser();
  try {
    await signInAs(browser.page, 'analyst');
    const first = async (path: string): Promise<string> => {
      const response = await browser.page.request.get(`${BASE_URL}${path}`);
      assert.equal(response.status(), 200, `GET ${path}`);
      const { items } = (await response.json()) as { items: { id: string }[] };
      assert.ok(items[0], `the demo has something at ${path}`);
      return items[0].id;
    };
    const list = async (path: string): Promise<{ id: string }[]> => {
      const response = await browser.page.request.get(`${BASE_URL}${path}`);
      assert.equal(response.status(), 200, `GET ${path}`);
      return ((await response.json()) as { items: { id: string }[] }).items;
    };
    // The demo's logged trips belong to one vehicle; its calibration page needs a calibration,
    // so the analyst asks for one when none exists yet (as a person would from that screen).
    let trip: { tripVehicleId: string; loggedTripId: string } | undefined;
    for (const vehicle of await list('/api/vehicles')) {
      const trips = await list(`/api/vehicles/${vehicle.id}/logged-trips`);
      if (trips[0]) {
        trip = { tripVehicleId: vehicle.id, loggedTripId: trips[0].id };
        break;
      }
    }
    assert.ok(trip, 'the demo has a vehicle with logged trips');
    let calibrationId = (await list(`/api/vehicles/${trip.tripVehicleId}/calibrations`))[0]?.id;
    if (!calibrationId) {
      const response = await browser.page.request.post(`${BASE_URL}/api/vehicles/${trip.tripVehicleId}/calibrations`, {
        data: { loggedTripIds: [trip.loggedTripId] },
        headers: { Origin: BASE_URL },
      });
      assert.equal(response.status(), 202, 'POST a calibration');
      calibrationId = ((await response.json()) as { id: string }).id;
    }
    return {
      routeId: await first('/api/routes'),
      reviewId: await first('/api/reviews'),
      batchRunId: await first('/api/batch-runs'),
      scenarioId: await first('/api/scenarios'),
      serviceDayId: await first('/api/service-days'),
      vehicleProfileId: await first('/api/vehicles'),
      ...trip,
      calibrationId,
    };
  } finally {
    await signOut(browser.page).catch(() => undefined);
    await browser.close();
  }
}

/**
 * The paths the router defines, read from its route files: the top table and each area's table
 * (a `*_ROUTES` constant imported from its `.routes.ts` file and given as `children`), joined with
 * the area's path.
 */
function routerPaths(): Set<string> {
  const webApp = join(import.meta.dirname, '..', '..', 'web', 'app');
  const top = readFileSync(join(webApp, 'app.routes.ts'), 'utf8');
  const areaFiles = new Map(
    [...top.matchAll(/import \{ (\w+_ROUTES) \} from '\.\/([^']+\.routes)';/g)].map(([, name, file]) => [name!, file!]),
  );
  assert.ok(areaFiles.size > 0, 'app.routes.ts imports no area tables: has the router table changed shape?');
  const paths = new Set<string>();
  const entries = [...top.matchAll(/path: '([^']*)'[\s\S]*?(?:children: (\w+_ROUTES)|loadComponent|redirectTo)/g)];
  for (const [, path, table] of entries) {
    if (table) {
      const children = areaFiles.get(table);
      assert.ok(children, `${table} is not imported from a .routes.ts file`);
      const feature = readFileSync(join(webApp, `${children}.ts`), 'utf8');
      for (const [, child] of feature.matchAll(/path: '([^']*)'/g)) paths.add(child ? `${path}/${child}` : path!);
    } else {
      paths.add(path!);
    }
  }
  return paths;
}
