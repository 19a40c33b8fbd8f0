import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

describe('network summary: board member', () => {
  const browser = signedInBrowser('board');

  it('shows the network figures, the factors with their sources and the chart', async () => {
    const { page } = browser;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Network summary' }).click();
    await page.getByRole('heading', { level: 1, name: 'Network summary', exact: true }).waitFor();
    await page.getByTestId('figure-recovered').waitFor();
    await page.locator('app-route-energy-chart canvas').waitFor();
    const size = page.viewportSize()!;
    await page.setViewportSize({ width: size.width, height: 2000 });
    await settleAnimations(page);
    await screenshot(page, 'board-summary');
    await page.setViewportSize(size);

    assert.match(await page.getByTestId('figure-recovered').innerText(), /[\d,.]+( million)? kWh/);
    assert.match(await page.getByTestId('figure-value').innerText(), /\d/);
    assert.match(await page.getByTestId('figure-co2').innerText(), /[\d.]+ t/);
    assert.match(await page.getByTestId('figure-friction').innerText(), /kWh/);
    assert.match(await page.getByTestId('tariff-source').innerText(), /per kWh \(source: .+\)[\s\S]*kg CO₂ per kWh \(source: .+\)/);
    assert.ok((await page.getByRole('table', { name: 'Energy per route and year' }).getByRole('row').count()) > 2);
    assert.match(await page.locator('article').innerText(), /regeneration/);
  });

  it('hides the navigation when printed', async () => {
    const { page } = browser;

    await page.emulateMedia({ media: 'print' });
    await screenshot(page, 'board-summary-print');
    const navVisible = await page.getByRole('navigation', { name: 'Main' }).isVisible();
    const topBarVisible = await page.getByRole('banner').isVisible();
    const pdfButtonVisible = await page.getByRole('link', { name: 'Download PDF' }).isVisible();
    await page.emulateMedia({ media: 'screen' });

    assert.equal(navVisible, false);
    assert.equal(topBarVisible, false);
    assert.equal(pdfButtonVisible, false);
    assert.equal(await page.getByTestId('figure-recovered').isVisible(), true);
  });

  it('downloads the summary as a PDF', async () => {
    const { page } = browser;

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Download PDF' }).click(),
    ]);
    const stream = await download.createReadStream();
    const chunks: Buffer[] = [];
    for await (const chunk of stream) chunks.push(chunk as Buffer);
    const pdf = Buffer.concat(chunks);

    assert.equal(pdf.subarray(0, 4).toString('latin1'), '%PDF');
    assert.match(download.suggestedFilename(), /\.pdf$/);
  });
});
