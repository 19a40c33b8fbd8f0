import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { DEMO_GTFS_FILE } from '../../api/demo/demo-gtfs';
import { BASE_URL, screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

/**
 * An analyst starts a new service day, imports the blocks of the demo GTFS feed's weekday service
 * through the file picker, places a depot charger, runs the day as a winter weekday with the
 * batteries at the end of their life and reads which blocks cannot be worked and why.
 */
describe('service days: blocks from the demo GTFS feed', () => {
  const browser = signedInBrowser('analyst', { width: 1400, height: 1000 });

  it('shows a feed that is not a zip as a named 400 in the import panel, keeping the draft', async () => {
    const { page } = browser;
    await page.goto(`${BASE_URL}/service-days/new`);
    await page.getByRole('heading', { level: 1, name: 'New service day' }).waitFor();
    await page.getByTestId('day-name').fill('Weekday from the feed, winter, end of life');
    await page.getByTestId('gtfs-import-open').click();
    await page.getByTestId('gtfs-file').setInputFiles({ name: 'timetable.txt', mimeType: 'text/plain', buffer: Buffer.from('trip_id\n') });
    const error = page.getByTestId('gtfs-error');
    await error.waitFor();
    assert.match(await error.innerText(), /timetable\.txt.*not a readable zip archive/);
    assert.equal(await page.getByTestId('day-name').inputValue(), 'Weekday from the feed, winter, end of life');
  });

  it('lists the feed’s services, previews the weekday blocks and adds them to the draft', async () => {
    const { page } = browser;
    await page.getByTestId('gtfs-file').setInputFiles(DEMO_GTFS_FILE);
    await page.getByTestId('gtfs-service').filter({ hasText: 'WKD' }).waitFor();
    await page.getByTestId('gtfs-service').click();
    const options = await page.getByRole('option').allInnerTexts();
    assert.deepEqual(
      options.map((text) => text.split(' ')[0]),
      ['WKD', 'SUN'],
    );
    await page.getByRole('option', { name: /^WKD/ }).click();
    await page.getByTestId('gtfs-profile').click();
    await page
      .getByRole('option', { name: /^12 m battery bus/ })
      .first()
      .click();
    await page.getByTestId('gtfs-preview').click();
    const table = page.getByTestId('gtfs-preview-table');
    await table.waitFor();
    const rows = await table.locator('tbody tr').allInnerTexts();
    assert.deepEqual(
      rows.map((row) => row.split('\t')[0]),
      ['P1', 'P2', 'V1', 'V2', 'V3'],
    );
    assert.match(rows[0]!, /4 Pass line/);
    assert.match(rows[2]!, /1 Valley line/);
    await settleAnimations(page);
    await screenshot(page, 'service-day-gtfs-preview-1400');
    await page.getByTestId('gtfs-add').click();
    await page.getByTestId('gtfs-import').waitFor({ state: 'detached' });
    await page.locator('app-service-day-timeline .bar.trip').first().waitFor();
    assert.equal(await page.locator('app-service-day-timeline .row').count(), 5);
  });

  it('places a depot charger, runs a winter weekday at end of battery life and reads which blocks fail and why', async () => {
    const { page } = browser;
    await page.getByRole('combobox', { name: 'Season' }).click();
    await page.getByRole('option', { name: /winter/i }).click();
    await page.getByRole('combobox', { name: 'Battery age' }).click();
    await page.getByRole('option', { name: /end of/i }).click();
    await page.getByTestId('place-depot').click();
    const map = page.getByTestId('charger-map');
    const box = (await map.boundingBox())!;
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await page
      .getByRole('table', { name: 'Chargers' })
      .locator('tbody tr')
      .filter({ has: page.locator('input') })
      .first()
      .waitFor();

    await page.getByTestId('save-and-run').click();
    await page.getByTestId('verdict').waitFor({ timeout: 120_000 });
    await page.waitForFunction(() => !document.querySelector('[aria-label="Running"], [aria-label="Waiting to run"]'), null, {
      timeout: 180_000,
    });
    const verdict = await page.getByTestId('verdict').innerText();
    assert.match(verdict, /[1-5] of 5 blocks? cannot be worked/);
    assert.match(verdict, /reserve/i);
    const failingOnScreen = await page
      .locator('.failing-block')
      .evaluateAll((blocks) => blocks.map((block) => (block as HTMLElement).dataset['block']!));
    const id = new URL(page.url()).pathname.split('/').at(-1)!;
    const result = (await (await page.request.get(`${BASE_URL}/api/service-days/${id}/result`)).json()) as {
      blocks: { blockId: string; feasible: boolean }[];
    };
    assert.deepEqual(result.blocks.map((block) => block.blockId).sort(), ['P1', 'P2', 'V1', 'V2', 'V3']);
    assert.deepEqual(
      [...failingOnScreen].sort(),
      result.blocks
        .filter((block) => !block.feasible)
        .map((block) => block.blockId)
        .sort(),
    );
    await settleAnimations(page);
    await screenshot(page, 'service-day-gtfs-result-1400');
  });

  it('deletes the day it made, so the demo’s own service days stay as shipped', async () => {
    const { page } = browser;
    await page.getByRole('button', { name: 'Delete', exact: true }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Delete service day' }).click();
    await page.getByRole('heading', { level: 1, name: 'Service days' }).waitFor();
    await page.getByRole('row').first().waitFor();
    assert.equal(await page.getByRole('row').filter({ hasText: 'Weekday from the feed' }).count(), 0);
  });
});
