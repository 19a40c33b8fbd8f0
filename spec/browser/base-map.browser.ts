import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { Page, Response } from 'playwright-core';
import { BASE_URL, screenshot, waitForCount } from './support/browser';
import { signedInBrowser } from './support/demo-people';

type Position = [number, number];

/** Clicks the map at a fraction of its width and height (a new route's view fits the reference network). */
async function clickMap(page: Page, fx: number, fy: number): Promise<void> {
  const box = await page.getByTestId('route-map').boundingBox();
  if (!box) throw new Error('The route map is not on screen');
  await page.mouse.click(box.x + box.width * fx, box.y + box.height * fy);
}

/** The route's vertices as the vertex table shows them. */
async function vertices(page: Page): Promise<Position[]> {
  const table = page.getByTestId('vertices-table');
  const count = (await table.getByRole('row').count()) - 1;
  const positions: Position[] = [];
  for (let i = 1; i <= count; i++) {
    const lon = Number(await table.getByRole('spinbutton', { name: `Longitude of vertex ${i}` }).inputValue());
    const lat = Number(await table.getByRole('spinbutton', { name: `Latitude of vertex ${i}` }).inputValue());
    positions.push([lon, lat]);
  }
  return positions;
}

describe('base map and snapped routes', () => {
  const browser = signedInBrowser('planner', { width: 1366, height: 900 });

  it('shows the demo base map under the terrain and snaps a drawn route to its roads', async () => {
    const { page } = browser;
    const baseTiles: Response[] = [];
    const outside: string[] = [];
    /** Which layer's tiles were asked for, in order. */
    const tilesAsked: ('terrain' | 'base')[] = [];
    page.on('response', (response) => {
      if (response.url().includes('/api/tiles/base/')) baseTiles.push(response);
    });
    page.on('request', (request) => {
      if (!request.url().startsWith(BASE_URL) && !request.url().startsWith('data:') && !request.url().startsWith('blob:'))
        outside.push(request.url());
      if (request.url().includes('/api/tiles/terrain/')) tilesAsked.push('terrain');
      if (request.url().includes('/api/tiles/base/')) tilesAsked.push('base');
    });
    await page.goto(`${BASE_URL}/routes/new`);
    await page.getByRole('heading', { level: 1, name: 'New route' }).waitFor();
    await page.locator('.leaflet-tile-loaded').first().waitFor();
    assert.equal(await page.getByRole('radio', { name: 'Base map and terrain' }).isChecked(), true);
    // The relief, the largest thing the map paints, is asked for first; the base map follows.
    await waitForCount(page.locator('.leaflet-app-basemap-pane canvas'), (count) => count > 0);
    assert.equal(tilesAsked[0], 'terrain', `the terrain's tiles are asked for first (${tilesAsked.slice(0, 6).join(', ')})`);
    assert.ok(tilesAsked.includes('base'));
    // Snapping is on by default where there are roads.
    assert.equal(await page.getByRole('switch', { name: 'Snap to roads' }).isChecked(), true);

    // Westgate Road west of Korvel town, then Brenn Road east of the town square: the path turns
    // at the square, so it carries the road's own vertices.
    await clickMap(page, 0.12, 0.48);
    await page.getByTestId('route-figures').getByText('Vertices 1').waitFor();
    await clickMap(page, 0.88, 0.46);
    await page.getByTestId('vertices-table').getByRole('row').nth(3).waitFor();
    await page.getByRole('img', { name: /Elevation along the route/ }).waitFor();
    await screenshot(page, 'base-map-snapped-route');

    // Tiles, fonts and scripts all come from Descentry itself.
    assert.deepEqual(outside, []);
    const tiles = await Promise.all(
      baseTiles.filter((response) => response.status() === 200).map((response) => response.body().catch(() => Buffer.alloc(0))),
    );
    assert.ok(
      tiles.some((body) => body.length > 0),
      'the map drew base-map tiles with content',
    );
    const drawn = await vertices(page);
    assert.ok(drawn.length >= 3, `the snapped route has the road's vertices (${drawn.length})`);
    // Every vertex lies on a road a bus may use, and the route is the road path between its ends.
    for (const vertex of drawn) {
      const onRoad = await page.request.post(`${BASE_URL}/api/road-network/path`, { data: { from: vertex, to: vertex } });
      assert.equal(onRoad.status(), 200);
      assert.ok((await onRoad.json()).snapDistancesM[0] < 0.5, `vertex ${vertex.join(', ')} lies on a road`);
    }
    const along = await page.request.post(`${BASE_URL}/api/road-network/path`, { data: { from: drawn[0], to: drawn.at(-1) } });
    const road = (await along.json()).geometry.coordinates as Position[];
    // The table shows 6 decimals (about 0.1 m).
    assert.equal(road.length, drawn.length);
    road.forEach((position, i) =>
      assert.ok(Math.hypot(position[0] - drawn[i]![0], position[1] - drawn[i]![1]) < 2e-6, `vertex ${i + 1} is the road's`),
    );
  });

  it('switches between the base map, the terrain and both', async () => {
    const { page } = browser;
    await page.getByRole('radio', { name: 'Base map', exact: true }).check();
    // The layers follow the choice a frame later; wait for it rather than reading at once.
    await waitForCount(page.locator('.leaflet-pane.leaflet-tile-pane .leaflet-layer'), 0);
    await waitForCount(page.locator('.leaflet-app-basemap-pane canvas'), (count) => count > 0);
    await page.getByRole('radio', { name: 'Terrain', exact: true }).check();
    await waitForCount(page.locator('.leaflet-app-basemap-pane canvas'), 0);
    await waitForCount(page.locator('.leaflet-pane.leaflet-tile-pane .leaflet-layer'), (count) => count > 0);
    await page.getByRole('radio', { name: 'Base map and terrain' }).check();
    await page.locator('.leaflet-app-basemap-pane canvas').first().waitFor();
  });
});
