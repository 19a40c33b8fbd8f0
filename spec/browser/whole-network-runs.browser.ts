import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

// Named to run last: a network run recomputes every in-service scenario, which the review and
// board tests read.
describe('network runs: analyst', () => {
  const browser = signedInBrowser('analyst');

  it('re-runs every in-service scenario and follows the progress to the end', async () => {
    const { page } = browser;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Network runs' }).click();
    await page.getByRole('heading', { level: 1, name: 'Network runs', exact: true }).waitFor();
    await page.getByRole('button', { name: 'Re-run all in-service scenarios' }).click();
    await page.getByRole('heading', { level: 1, name: 'Network run', exact: true }).waitFor();
    const progress = page.getByTestId('batch-progress');
    await progress.waitFor();
    await screenshot(page, 'batch-run-progress');

    await progress.getByText(/^Finished/).waitFor({ timeout: 120_000 });
    await settleAnimations(page);
    await screenshot(page, 'batch-run-done');

    const text = await progress.innerText();
    const [, done, total] = /(\d+) of (\d+) scenarios done/.exec(text) ?? [];
    assert.ok(Number(total) > 0, text);
    assert.match(text, /\(100 %\)/);
    assert.equal(await page.getByRole('table', { name: 'Scenarios in this run' }).getByRole('row').count(), Number(total) + 1);
    assert.ok(Number(done) <= Number(total));

    await page.getByRole('link', { name: 'All network runs' }).click();
    await page.getByRole('list', { name: 'Network runs' }).getByRole('listitem').first().waitFor();
  });
});
