import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { describe, it } from 'node:test';
import { MARGIN_PT } from '../../api/pdf/pdf-layout';
import { RAW_VALUE_PATTERNS, readPdfWords, wordsOutsideMargins } from '../support/pdf-words';
import { BASE_URL, screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

/**
 * An analyst opens the demo's winter weekday with batteries at the end of their life, runs it,
 * reads which block cannot be worked and why, and downloads the CSV and the PDF report.
 */
describe('service days: analyst', () => {
  const browser = signedInBrowser('analyst', { width: 1400, height: 900 });
  let failingOnScreen: string[] = [];

  it('opens the winter weekday at end of battery life from the list', async () => {
    const { page } = browser;
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Service days' }).click();
    await page.getByRole('heading', { level: 1, name: 'Service days' }).waitFor();
    const row = page
      .getByRole('row')
      .filter({ hasText: 'Weekday' })
      .filter({ hasText: 'Winter' })
      .filter({ hasText: 'End of battery life' });
    await row.first().waitFor();
    assert.equal(await row.count(), 1, 'the demo has one winter weekday at end of battery life');
    await screenshot(page, 'service-days-list-1400');
    await row.getByRole('link').click();
    await page
      .getByRole('heading', { level: 1 })
      .filter({ hasText: /winter/i })
      .waitFor();
  });

  it('runs it, following the status to the end, and reads which block fails and why', async () => {
    const { page } = browser;
    const runButton = page.getByTestId('run-button');
    await runButton.click();
    // The page polls the run's status and shows the verdict when the run is done.
    await page.getByTestId('verdict').waitFor({ timeout: 120_000 });
    await page.waitForFunction(() => !document.querySelector('[aria-label="Running"], [aria-label="Waiting to run"]'), null, {
      timeout: 120_000,
    });
    const verdict = await page.getByTestId('verdict').innerText();
    assert.match(verdict, /[1-9]\d* of \d+ blocks? cannot be worked/);
    failingOnScreen = await page
      .locator('.failing-block')
      .evaluateAll((blocks) => blocks.map((block) => (block as HTMLElement).dataset['block']!));
    assert.ok(failingOnScreen.length > 0);
    // The reasons are in words, with the reserve it fell below.
    assert.match(verdict, /reserve/i);
    // The block table lists the blocks that cannot be worked first.
    const firstRow = await page.getByTestId('block-table').locator('tbody tr').first().innerText();
    assert.match(firstRow, /Cannot be worked/);
    assert.ok(await page.getByTestId('soc-chart').locator('canvas').isVisible());
    assert.ok(await page.getByTestId('advice-cautions').isVisible());

    // The screen agrees with the stored result.
    const id = new URL(page.url()).pathname.split('/').at(-1)!;
    const response = await page.request.get(`${BASE_URL}/api/service-days/${id}/result`);
    const result = (await response.json()) as { blocks: { blockId: string; feasible: boolean }[] };
    assert.deepEqual(
      [...failingOnScreen].sort(),
      result.blocks
        .filter((block) => !block.feasible)
        .map((block) => block.blockId)
        .sort(),
    );
    const size = page.viewportSize()!;
    await page.setViewportSize({ width: size.width, height: 2600 });
    await settleAnimations(page);
    await screenshot(page, 'service-day-result-1400');
    await page.setViewportSize({ width: 390, height: 2600 });
    await settleAnimations(page);
    await screenshot(page, 'service-day-result-390');
    await page.setViewportSize(size);
  });

  it('downloads the CSV with every block, the failing one marked', async () => {
    const { page } = browser;
    await page.getByTestId('export-menu').click();
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-csv').click()]);
    const text = readFileSync((await download.path())!, 'utf8');
    const lines = text.split(/\r?\n/);
    assert.match(lines[0]!, /^# /);
    for (const blockId of failingOnScreen)
      assert.ok(
        lines.some((line) => line.includes(blockId)),
        `the CSV lists block ${blockId}`,
      );
  });

  it('downloads the PDF report: A4 inside its margins, the failing block and its reasons, the cautions', async () => {
    const { page } = browser;
    const verdict = await page.getByTestId('verdict').innerText();
    await page.getByTestId('export-menu').click();
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-pdf').click()]);
    const pdf = readPdfWords(readFileSync((await download.path())!));

    assert.deepEqual(wordsOutsideMargins(pdf, MARGIN_PT), []);
    const text = pdf.text.join(' ');
    for (const raw of RAW_VALUE_PATTERNS) assert.doesNotMatch(text, raw);
    const heading = /(\d+ of \d+ blocks? cannot be worked)/.exec(verdict)![1]!;
    assert.ok(text.includes(heading), `the report says "${heading}" as the screen does`);
    for (const blockId of failingOnScreen) assert.ok(text.includes(`Block ${blockId}:`), `the report names block ${blockId}`);
    assert.match(text, /licensed engineer/);
  });

  it('opens the editor with the blocks on a timeline and the chargers on the map', async () => {
    const { page } = browser;
    await page.getByRole('link', { name: 'Edit' }).click();
    await page.getByRole('heading', { level: 1, name: 'Edit service day' }).waitFor();
    await page.locator('app-service-day-timeline .bar.trip').first().waitFor();
    assert.ok((await page.locator('app-service-day-timeline .row').count()) > 1);
    assert.ok((await page.getByRole('table', { name: 'Chargers' }).locator('tbody tr').count()) >= 2);
    await settleAnimations(page);
    await screenshot(page, 'service-day-editor-1400');
    await page.setViewportSize({ width: 390, height: 900 });
    await settleAnimations(page);
    await screenshot(page, 'service-day-editor-390');
  });
});
