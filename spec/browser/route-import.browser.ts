import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Page } from 'playwright-core';
import { BASE_URL, screenshot } from './support/browser';
import { signedInBrowser } from './support/demo-people';
import { PageWatch } from './support/page-watch';

/**
 * Importing real files as a planner does: a GPX track with its own elevations and a GeoJSON line,
 * through the file chooser, as shipped. The files are written fresh for each run (their names
 * carry the time), so a rerun against the same database imports them anew.
 */
describe('route import: GeoJSON and GPX files', () => {
  const browser = signedInBrowser('planner', { width: 1366, height: 900 });
  const stamp = Date.now();
  let dir: string;
  let gpxPath: string;
  let geoJsonPath: string;

  before(async () => {
    dir = mkdtempSync(join(tmpdir(), 'descentry-import-'));
    const road = await longestRoad(browser.page);
    gpxPath = join(dir, `recorded-${stamp}.gpx`);
    writeFileSync(gpxPath, gpxTrack(`Recorded descent ${stamp}`, road));
    geoJsonPath = join(dir, `surveyed-${stamp}.geojson`);
    writeFileSync(geoJsonPath, geoJsonLine(`Surveyed line ${stamp}`, road));
  });
  after(() => rmSync(dir, { recursive: true, force: true }));

  it('imports a GPX track with its own elevations, shows the new route and lists it (issue 10)', async () => {
    const { page } = browser;
    const watch = new PageWatch(page);
    try {
      await page.goto(`${BASE_URL}/routes`);
      await page.getByRole('heading', { level: 1, name: 'Routes' }).waitFor();
      await importFile(page, gpxPath);

      const result = page.getByTestId('import-result');
      await result.waitFor();
      assert.match(await result.innerText(), new RegExp(`Imported 1 route from recorded-${stamp}\\.gpx: Recorded descent ${stamp}\\.`));
      assert.match(await result.innerText(), /Elevations: the file’s own, at every point\./);
      await page
        .getByRole('table')
        .getByRole('link', { name: `Recorded descent ${stamp}` })
        .waitFor();
      await screenshot(page, 'route-import-done');
      assert.deepEqual(watch.take(), []);

      // The very same file again: refused, with the way to the route it made; no duplicate row.
      await importFile(page, gpxPath);
      const refusal = page.getByTestId('import-error');
      await refusal.waitFor();
      assert.match(
        await refusal.innerText(),
        new RegExp(`recorded-${stamp}\\.gpx was imported before, as the route “Recorded descent ${stamp}”`),
      );
      assert.equal(
        await page
          .getByRole('table')
          .getByRole('link', { name: `Recorded descent ${stamp}` })
          .count(),
        1,
      );
      const seen = watch.take().map((problem) => problem.detail);
      assert.ok(
        seen.every((detail) => /\/api\/routes\/import.*409|409 \(Conflict\)/.test(detail)),
        seen.join('\n'),
      );

      await refusal.getByRole('link', { name: `Open “Recorded descent ${stamp}”` }).click();
      await page.waitForURL(/\/routes\/[0-9a-f-]{36}$/);
      const source = page.getByTestId('elevation-source');
      await source.waitFor();
      assert.match(await source.innerText(), /the route’s own, recorded at every vertex/);
      assert.deepEqual(watch.take(), []);
    } finally {
      watch.stop();
    }
  });

  it("uses the terrain's elevations when the planner chooses them", async () => {
    const { page } = browser;
    await page.goto(`${BASE_URL}/routes`);
    await page.getByRole('heading', { level: 1, name: 'Routes' }).waitFor();
    await page.getByRole('button', { name: 'Import GeoJSON or GPX' }).click();
    await page.getByRole('radio', { name: /terrain models’ elevations/ }).check();

    await importFile(page, geoJsonPath, { panelOpen: true });

    const result = page.getByTestId('import-result');
    await result.waitFor();
    assert.match(await result.innerText(), /Elevations: from the terrain models, as chosen/);
    await result.getByRole('link', { name: `Surveyed line ${stamp}` }).click();
    await page.getByTestId('elevation-source').getByText('Elevations: from the terrain models.').waitFor();
  });
});

async function importFile(page: Page, path: string, { panelOpen = false } = {}): Promise<void> {
  if (!panelOpen) {
    await page.getByRole('button', { name: 'Import GeoJSON or GPX' }).click();
  }
  const [chooser] = await Promise.all([
    page.waitForEvent('filechooser'),
    page.getByRole('button', { name: 'Choose the file and import' }).click(),
  ]);
  await chooser.setFiles(path);
}

type Position = [number, number];

/** The demo's longest road, so the imported line lies on the demo terrain. */
async function longestRoad(page: Page): Promise<Position[]> {
  const response = await page.request.get(`${BASE_URL}/api/road-network`);
  const network = (await response.json()) as { features: { geometry: { coordinates: Position[] } }[] };
  return network.features.map((feature) => feature.geometry.coordinates).reduce((a, b) => (b.length > a.length ? b : a));
}

/** A GPX 1.1 track along the road, with a made-up recorded elevation at every point. */
function gpxTrack(name: string, road: Position[]): string {
  const points = road
    .slice(0, 4)
    .map(([lon, lat], index) => `      <trkpt lat="${lat}" lon="${lon}"><ele>${(1500 - index * 40.5).toFixed(1)}</ele></trkpt>`)
    .join('\n');
  return `<?xml version="1.0" encoding="UTF-8"?>
<gpx version="1.1" creator="browser test" xmlns="http://www.topografix.com/GPX/1/1">
  <trk><name>${name}</name><trkseg>
${points}
  </trkseg></trk>
</gpx>
`;
}

/** A GeoJSON Feature along the road, with elevations the planner chooses to set aside. */
function geoJsonLine(name: string, road: Position[]): string {
  return JSON.stringify({
    type: 'Feature',
    properties: { name },
    geometry: { type: 'LineString', coordinates: road.slice(0, 3).map(([lon, lat], index) => [lon, lat, 1400 - index * 30]) },
  });
}
