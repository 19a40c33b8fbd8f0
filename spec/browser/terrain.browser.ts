import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { after, before, describe, it } from 'node:test';
import { writeFloat32GeoTiff } from '../../api/terrain/raster/geotiff-writer';
import { screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

describe('terrain', () => {
  const browser = signedInBrowser('analyst', { width: 1400, height: 950 });
  const folder = mkdtempSync(join(tmpdir(), 'descentry-terrain-browser-'));
  const name = `Orren slope ${Date.now()}`;
  const file = join(folder, 'orren-slope.tif');

  before(() => writeFileSync(file, smallGeoTiff()));
  after(() => rmSync(folder, { recursive: true, force: true }));

  it('shows the catalogue with the demo model and our own terrain tiles on the map', async () => {
    const { page } = browser;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Terrain' }).click();
    await page.getByRole('heading', { level: 1, name: 'Terrain', exact: true }).waitFor();
    const table = page.getByRole('table', { name: 'Terrain models' });
    await table.getByRole('cell', { name: 'Korvel valley (demo, 20 m)' }).waitFor();
    // Leaflet asks the API for tiles; at least one must come back as a loaded image.
    await page.waitForFunction(() =>
      [...document.querySelectorAll<HTMLImageElement>('img.leaflet-tile')].some(
        (img) => img.src.includes('/api/tiles/terrain/') && img.complete && img.naturalWidth === 256,
      ),
    );
    await table.getByRole('cell', { name: 'Korvel valley (demo, 20 m)' }).click();
    await page.getByTestId('terrain-detail').getByText('Quality notes').waitFor();
    // Every visible tile rendered and faded in (Leaflet marks loaded tiles; the fade takes 0.2 s).
    await page.waitForFunction(() =>
      [...document.querySelectorAll<HTMLImageElement>('img.leaflet-tile')].every((img) => img.classList.contains('leaflet-tile-loaded')),
    );
    await page.waitForTimeout(400);
    await settleAnimations(page);
    await screenshot(page, 'terrain-catalogue');
  });

  it('uploads a GeoTIFF through the file picker, shows progress, then the model ready', async () => {
    const { page } = browser;

    await page.getByTestId('terrain-file-input').setInputFiles(file);
    await page.getByLabel('Name in the catalogue').fill(name);
    await page.getByRole('button', { name: 'Upload', exact: true }).click();
    await page
      .getByRole('status')
      .filter({ hasText: /Uploading|Uploaded/ })
      .first()
      .waitFor();
    await page.getByText(`“${name}” is ready.`).waitFor({ timeout: 60_000 });
    const table = page.getByRole('table', { name: 'Terrain models' });
    await table.getByRole('row').filter({ hasText: name }).getByText('Ready').waitFor();
    await screenshot(page, 'terrain-uploaded');

    const detail = page.getByTestId('terrain-detail');
    assert.match((await detail.textContent()) ?? '', /EPSG:32632/);
  });

  it('deletes the uploaded model after confirmation', async () => {
    const { page } = browser;

    await page.getByTestId('terrain-detail').getByRole('button', { name: 'Delete' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('button', { name: 'Delete terrain' }).click();
    await page.getByRole('table', { name: 'Terrain models' }).getByRole('cell', { name }).waitFor({ state: 'detached' });
  });
});

/** A 120 × 90 Float32 slope near Orren (UTM 32N), unique per run so re-runs are not duplicates. */
function smallGeoTiff(): Buffer {
  const widthPx = 120;
  const heightPx = 90;
  const values = new Float32Array(widthPx * heightPx);
  const offset = (Date.now() % 1000) / 10;
  for (let row = 0; row < heightPx; row++) {
    for (let col = 0; col < widthPx; col++) values[row * widthPx + col] = 1200 + offset + 4 * col + 2.5 * row + 30 * Math.sin(col / 9);
  }
  return writeFloat32GeoTiff({
    widthPx,
    heightPx,
    values,
    epsg: 32632,
    originX: 622_000,
    originY: 5_171_000,
    pixelSizeM: 20,
    nodata: -9999,
  });
}
