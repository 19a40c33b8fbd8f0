import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { Page } from 'playwright-core';
import { BASE_URL, screenshot } from './support/browser';
import { signedInBrowser } from './support/demo-people';
import { PageWatch } from './support/page-watch';

/**
 * Snapping as shipped: on by default for a planner when a road network is loaded. What is checked
 * is what a planner gets (the line follows the roads), not how the server finds the path.
 */
describe('route editor: snap to roads (on by default)', () => {
  const browser = signedInBrowser('planner', { width: 1366, height: 900 });

  it('asks for each terrain tile once, with the catalogue version in its address (issue 10: a dozen were fetched twice)', async () => {
    const { page } = browser;
    const tiles: string[] = [];
    const collect = (request: { url(): string }) => {
      if (request.url().includes('/api/tiles/terrain/')) tiles.push(new URL(request.url()).pathname + new URL(request.url()).search);
    };
    page.on('request', collect);
    try {
      await page.goto(`${BASE_URL}/routes/new`);
      await page.locator('.leaflet-tile-loaded').first().waitFor();
      await page.waitForLoadState('networkidle');
    } finally {
      page.off('request', collect);
    }

    assert.ok(tiles.length > 0);
    const versions = new Set(tiles.map((tile) => new URL(tile, BASE_URL).searchParams.get('v')));
    assert.deepEqual([...versions].length, 1, `one version for every tile: ${[...versions].join(', ')}`);
    assert.ok(!versions.has(null), 'every tile address carries the catalogue version');
    const paths = tiles.map((tile) => tile.split('?')[0]);
    assert.equal(new Set(paths).size, paths.length, 'no tile is asked for twice');
  });

  it('draws along the roads of the network when the planner clicks near them', async () => {
    const { page } = browser;
    const watch = new PageWatch(page);
    try {
      const roads = await roadNetwork(page);
      await page.goto(`${BASE_URL}/routes/new`);
      await page.getByRole('heading', { level: 1, name: 'New route' }).waitFor();
      await page.locator('.leaflet-tile-loaded').first().waitFor();
      const snap = page.getByRole('switch', { name: 'Snap to roads' });
      await page.waitForFunction(() => document.querySelector('[role="switch"][aria-checked="true"]') !== null);
      // The view fits the road network once it has loaded; click only when the map stands still.
      await page.waitForLoadState('networkidle');
      assert.equal(await snap.getAttribute('aria-checked'), 'true', 'snapping is on by default');

      // Two bends of the longest road, a few bends apart: a planner clicks on the road itself.
      const road = roads.reduce((longest, line) => (line.length > longest.length ? line : longest));
      await clickAt(page, road[1]!);
      // The editor finds one path at a time: wait for the first point to land, as a person would.
      await page.getByTestId('route-figures').getByText('Vertices 1').waitFor();
      await clickAt(page, road[Math.min(road.length - 2, 5)]!);
      await screenshot(page, 'route-editor-snapped');
      await page.waitForFunction(() =>
        /Vertices ([3-9]|\d\d+)/.test(document.querySelector('[data-testid="route-figures"]')?.textContent ?? ''),
      );

      const vertices = await vertexTable(page);
      assert.ok(vertices.length > 2, `the second click adds a path along the roads (${vertices.length} vertices)`);
      for (const [index, vertex] of vertices.slice(1).entries()) {
        const offM = distanceToNetworkM(vertex, roads);
        assert.ok(offM < 1, `vertex ${index + 2} lies on a road (${offM.toFixed(2)} m off)`);
      }
      assert.equal(await page.getByText('without snapping').count(), 0, 'no "added without snapping" message');
      assert.deepEqual(watch.take(), []);
    } finally {
      watch.stop();
    }
  });

  it('keeps a second click made while the first path is still being found, and adds both in order', async () => {
    const { page } = browser;
    const watch = new PageWatch(page);
    try {
      const roads = await roadNetwork(page);
      await page.goto(`${BASE_URL}/routes/new`);
      await page.getByRole('heading', { level: 1, name: 'New route' }).waitFor();
      await page.locator('.leaflet-tile-loaded').first().waitFor();
      await page.waitForLoadState('networkidle');
      // Every path waits a moment at the server, so the clicks surely come while one is being found.
      await page.route('**/api/road-network/path*', async (route) => {
        await new Promise((done) => setTimeout(done, 400));
        await route.continue();
      });
      const road = roads.reduce((longest, line) => (line.length > longest.length ? line : longest));
      assert.ok(road.length >= 5, `the longest demo road has bends to click on (${road.length} points)`);
      const first = road[1]!;
      const second = road[Math.floor(road.length / 2)]!;
      const third = road[road.length - 2]!;

      await clickAt(page, first);
      await clickAt(page, second);
      await clickAt(page, third);
      await page.getByText(/Following the roads/).waitFor();
      await page.waitForFunction(() => !/Following the roads/.test(document.body.textContent ?? ''));

      const vertices = await vertexTable(page);
      const nearestM = (point: LonLat) => Math.min(...vertices.map((vertex) => metresBetween(vertex, point)));
      // Each click lands on the road within a few pixels of where it was made (the view is some
      // metres per pixel), and the route ends at the last one: none was dropped.
      const clicksApartM = Math.min(metresBetween(first, second), metresBetween(second, third));
      for (const [name, point] of [
        ['first', first],
        ['second', second],
        ['third', third],
      ] as const) {
        assert.ok(
          nearestM(point) < clicksApartM / 4,
          `the ${name} click is on the route (${nearestM(point).toFixed(1)} m from its nearest vertex)`,
        );
      }
      assert.ok(metresBetween(vertices.at(-1)!, third) < clicksApartM / 4, 'the route ends at the last click');
      const order = [first, second, third].map((point) => vertices.findIndex((vertex) => metresBetween(vertex, point) === nearestM(point)));
      assert.ok(order[0]! < order[1]! && order[1]! < order[2]!, `the clicks are applied in the order made (${order.join(', ')})`);
      assert.equal(await page.getByText('without snapping').count(), 0, 'no "added without snapping" message');
      await page.unroute('**/api/road-network/path*');
      assert.deepEqual(watch.take(), []);
    } finally {
      watch.stop();
    }
  });

  it('keeps the map where it is when the speed-limit tool is chosen (issue 10: it moved 64 px)', async () => {
    const { page } = browser;
    const before = (await page.getByTestId('route-map').boundingBox())!;

    await page.getByRole('radio', { name: /Speed limit/ }).click();
    await page.getByLabel(/New stretch/).waitFor();
    const after = (await page.getByTestId('route-map').boundingBox())!;

    assert.equal(after.y, before.y);
    assert.equal(after.height, before.height);
  });

  it('names new stops by where they are, so the names read in order whatever order they are placed in', async () => {
    const { page } = browser;
    const vertices = await vertexTable(page);
    await page.getByRole('radio', { name: /Stop/ }).click();

    await clickAt(page, vertices.at(-2)!);
    await page.getByTestId('stops-table').getByRole('textbox', { name: 'Name of stop 1' }).waitFor();
    await clickAt(page, vertices[1]!);
    await page.getByTestId('stops-table').getByRole('textbox', { name: 'Name of stop 2' }).waitFor();

    const names = await page
      .getByTestId('stops-table')
      .getByRole('textbox', { name: /^Name of stop/ })
      .evaluateAll((inputs) => inputs.map((input) => (input as HTMLInputElement).value));
    const kilometres = names.map((name) => Number(/^Stop at ([\d.]+) km$/.exec(name)?.[1]));
    assert.equal(names.length, 2, names.join(', '));
    assert.ok(kilometres.every(Number.isFinite), names.join(', '));
    assert.ok(kilometres[0]! < kilometres[1]!, `in order along the route: ${names.join(', ')}`);
  });
});

type LonLat = [number, number];

async function roadNetwork(page: Page): Promise<LonLat[][]> {
  const response = await page.request.get(`${BASE_URL}/api/road-network`);
  assert.equal(response.status(), 200);
  const network = (await response.json()) as { features: { geometry: { coordinates: number[][] } }[] };
  assert.ok(network.features.length > 0, 'the demo has a road network');
  return network.features.map((feature) => feature.geometry.coordinates.map(([lon, lat]) => [lon!, lat!] as LonLat));
}

/**
 * Clicks the map at a longitude and latitude. Where that is on screen is read from a loaded
 * terrain tile (its z/x/y in the address and its box on the page), so nothing of the map's code
 * is needed: Web Mercator tile arithmetic (common practice, the XYZ tile scheme).
 */
async function clickAt(page: Page, [lon, lat]: LonLat): Promise<void> {
  // A loaded tile of the level on show: Leaflet keeps older levels in containers of lower z-index.
  const tile = await page.evaluate(() => {
    const containers = [...document.querySelectorAll<HTMLElement>('[data-testid="route-map"] .leaflet-tile-container')]
      .filter((container) => container.querySelector('img.leaflet-tile-loaded[src*="/api/tiles/terrain/"]'))
      .sort((a, b) => Number(b.style.zIndex || 0) - Number(a.style.zIndex || 0));
    const img = containers[0]?.querySelector<HTMLImageElement>('img.leaflet-tile-loaded[src*="/api/tiles/terrain/"]');
    if (!img) return null;
    const rect = img.getBoundingClientRect();
    return { src: img.getAttribute('src') ?? '', x: rect.x, y: rect.y, width: rect.width, height: rect.height };
  });
  if (!tile) throw new Error('No terrain tile on show to place the click by');
  const [, z, x, y] = /\/api\/tiles\/terrain\/(\d+)\/(\d+)\/(\d+)\.png/.exec(tile.src)!.map(Number) as number[];
  const scale = 2 ** z!;
  const worldX = ((lon + 180) / 360) * scale;
  const sinLat = Math.sin((lat * Math.PI) / 180);
  const worldY = (0.5 - Math.log((1 + sinLat) / (1 - sinLat)) / (4 * Math.PI)) * scale;
  await page.mouse.click(tile.x + (worldX - x!) * tile.width, tile.y + (worldY - y!) * tile.height);
}

/** The vertices as the vertex table shows them. */
async function vertexTable(page: Page): Promise<LonLat[]> {
  const table = page.getByTestId('vertices-table');
  const longitudes = await table
    .getByRole('spinbutton', { name: /^Longitude of vertex/ })
    .evaluateAll((inputs) => inputs.map((input) => Number((input as HTMLInputElement).value)));
  const latitudes = await table
    .getByRole('spinbutton', { name: /^Latitude of vertex/ })
    .evaluateAll((inputs) => inputs.map((input) => Number((input as HTMLInputElement).value)));
  return longitudes.map((lon, index) => [lon, latitudes[index]!]);
}

/** Distance between two points, m (local equirectangular plane; fine at road scale). */
function metresBetween([lonA, latA]: LonLat, [lonB, latB]: LonLat): number {
  const eastM = 111_320 * Math.cos((((latA + latB) / 2) * Math.PI) / 180);
  return Math.hypot((lonB - lonA) * eastM, (latB - latA) * 111_320);
}

/** Shortest distance from a point to any road segment, m (local equirectangular plane; fine at road scale). */
function distanceToNetworkM([lon, lat]: LonLat, roads: LonLat[][]): number {
  const northM = 111_320;
  const eastM = 111_320 * Math.cos((lat * Math.PI) / 180);
  const plane = ([x, y]: LonLat) => [(x - lon) * eastM, (y - lat) * northM] as const;
  let best = Number.POSITIVE_INFINITY;
  for (const road of roads) {
    for (let i = 1; i < road.length; i++) {
      const [ax, ay] = plane(road[i - 1]!);
      const [bx, by] = plane(road[i]!);
      const lengthSquared = (bx - ax) ** 2 + (by - ay) ** 2;
      const t = lengthSquared === 0 ? 0 : Math.max(0, Math.min(1, -(ax * (bx - ax) + ay * (by - ay)) / lengthSquared));
      best = Math.min(best, Math.hypot(ax + t * (bx - ax), ay + t * (by - ay)));
    }
  }
  return best;
}
