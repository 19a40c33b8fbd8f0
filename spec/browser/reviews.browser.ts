import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { Page } from 'playwright-core';
import { BASE_URL, screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

/**
 * The pages scroll inside the shell, so a full-page screenshot shows one screen: take it on a
 * taller window, then restore the size the test runs at.
 */
async function tallScreenshot(page: Page, name: string): Promise<void> {
  const size = page.viewportSize() ?? { width: 1280, height: 800 };
  await page.setViewportSize({ width: size.width, height: 1900 });
  await page.waitForTimeout(300);
  await settleAnimations(page);
  await screenshot(page, name);
  await page.setViewportSize(size);
}

/** Opens the review queue from the side navigation and waits for its table. */
async function openQueue(page: Page): Promise<void> {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Descent review' }).click();
  await page.getByRole('heading', { level: 1, name: 'Descent review', exact: true }).waitFor();
  await page.getByRole('table', { name: 'Review items' }).getByRole('row').nth(1).waitFor();
}

/** Opens the first high-risk item of the queue (the demo network has one on the ski shuttle). */
async function openHighRiskItem(page: Page): Promise<void> {
  await page.getByRole('combobox', { name: 'Risk' }).click();
  await page.getByRole('option', { name: 'High', exact: true }).click();
  const table = page.getByRole('table', { name: 'Review items' });
  await table.getByRole('row').nth(1).getByRole('link').first().click();
  await page.getByRole('heading', { level: 2, name: 'Audit trail' }).waitFor();
}

describe('descent review: safety officer', () => {
  const browser = signedInBrowser('safety');

  it('opens the queue with counts per state and the caution', async () => {
    const { page } = browser;

    await openQueue(page);
    await settleAnimations(page);
    await screenshot(page, 'reviews-queue-safety');

    assert.match(await page.getByLabel('Engineering caution').innerText(), /licensed engineers decide/);
    assert.equal(await page.getByRole('navigation', { name: 'Review items per state' }).getByRole('button').count(), 5);
  });

  it('records a mitigation with a re-run on a high-risk descent and shows the new risk and the audit event', async () => {
    const { page } = browser;
    await openQueue(page);
    await openHighRiskItem(page);
    await page.locator('app-terrain-map .leaflet-tile-loaded').first().waitFor({ state: 'attached' });
    await tallScreenshot(page, 'reviews-detail-safety');

    // Bring the item to "In review" whatever earlier runs left it in.
    const state = await page.getByTestId('current-state').innerText();
    if (/Mitigated|Risk accepted/.test(state)) {
      await page.getByRole('button', { name: 'Reopen' }).click();
      await page.getByRole('form', { name: 'Reopen' }).getByLabel('Note').fill('Checking the mitigation again in the browser test');
      await page.getByRole('button', { name: 'Reopen item' }).click();
      await page.getByTestId('current-state').getByText('Reopened').waitFor();
    }
    if (!/In review/.test(await page.getByTestId('current-state').innerText())) {
      await page.getByRole('button', { name: 'Acknowledge' }).click();
      await page.getByTestId('current-state').getByText('In review').waitFor();
    }
    const eventsBefore = await page.getByTestId('audit-event').count();

    await page.getByRole('button', { name: 'Record mitigation' }).click();
    const form = page.getByRole('form', { name: 'Record mitigation' });
    await form.getByRole('button', { name: 'Save mitigation' }).click();
    await page.getByTestId('no-measure').waitFor();
    await form.getByLabel('Descent speed cap').fill('20');
    await form.getByLabel('Note').fill('20 km/h signs on the pass descent');
    assert.equal(await form.getByRole('checkbox', { name: /Re-run with this mitigation/ }).isChecked(), true);
    await screenshot(page, 'reviews-mitigation-form');
    await form.getByRole('button', { name: 'Save mitigation' }).click();

    await page.getByTestId('current-state').getByText('Mitigated').waitFor();
    const result = page.getByTestId('rerun-result');
    await result.waitFor();
    const rerun = /With the mitigation, the re-run gives\s+Risk: (Low|Elevated|High|Critical)/.exec(await result.innerText());
    assert.ok(rerun, await result.innerText());
    // The header shows the risk that stands now, the mitigated one (issue 10: it kept "Critical").
    const header = await page.getByTestId('current-risk').innerText();
    assert.match(header, rerun[1] === 'High' ? /^Risk: High$/ : new RegExp(`^Risk with mitigation: ${rerun[1]}$`));
    await page.getByTestId('audit-event').nth(eventsBefore).waitFor();
    const lastEvent = page.getByTestId('audit-event').last();
    const lastEventText = await lastEvent.innerText();
    assert.match(lastEventText, /Ilse Rautenberg|safety/i);
    assert.match(lastEventText, /In review[\s\S]*Mitigated/);
    assert.match(lastEventText, /Descent speed cap\s*20 km\/h/);
    assert.match(lastEventText, /Risk before\s*High/);
    assert.match(lastEventText, /Risk after\s*(Low|Elevated|High|Critical)/);
    await tallScreenshot(page, 'reviews-detail-after-mitigation');
  });
});

describe('descent review: planner reads only', () => {
  const browser = signedInBrowser('planner', { width: 1024, height: 768 });

  it('sees the queue and an item with its audit trail but no action buttons', async () => {
    const { page } = browser;

    await page.goto(`${BASE_URL}/reviews`);
    await page.getByRole('table', { name: 'Review items' }).getByRole('row').nth(1).waitFor();
    await screenshot(page, 'reviews-queue-planner-tablet');
    await page.getByRole('table', { name: 'Review items' }).getByRole('row').nth(1).getByRole('link').first().click();
    await page.getByRole('heading', { level: 2, name: 'Audit trail' }).waitFor();
    await page.locator('app-terrain-map .leaflet-tile-loaded').first().waitFor({ state: 'attached' });
    await tallScreenshot(page, 'reviews-detail-planner-tablet');

    for (const name of ['Acknowledge', 'Record mitigation', 'Accept risk', 'Reopen']) {
      assert.equal(await page.getByRole('button', { name }).count(), 0, `no "${name}" button`);
    }
    assert.match(await page.getByText('Only safety officers can change a review item').innerText(), /follow every decision/);
    assert.match(await page.getByLabel('Engineering caution').innerText(), /Engineering estimates/);
  });
});
