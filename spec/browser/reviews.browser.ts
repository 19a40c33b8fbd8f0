import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { Page } from 'playwright-core';
import { BASE_URL, openBrowser, screenshot, settleAnimations } from './support/browser';
import { signInAsSecondSafetyOfficer, signOut, signedInBrowser } from './support/demo-people';

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

/** Opens the first critical item of the queue (with regeneration lost, the demo's pass descents are critical). */
async function openHighRiskItem(page: Page): Promise<void> {
  await page.getByRole('combobox', { name: 'Risk' }).click();
  await page.getByRole('option', { name: 'Critical', exact: true }).click();
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
    assert.equal(await page.getByRole('navigation', { name: 'Review items per state' }).getByRole('button').count(), 6);
  });

  it('shows a critical descent’s worst case beside the nominal run with its sensitivity chart, on the item and on the scenario result', async () => {
    const { page } = browser;
    await openQueue(page);
    await openHighRiskItem(page);

    const assessment = page.getByTestId('descent-assessment');
    await assessment.waitFor();
    assert.match(await assessment.getByTestId('worst-case').innerText(), /Critical/);
    assert.match(await assessment.getByTestId('worst-case-conditions').innerText(), /regeneration lost/);
    assert.match(await assessment.getByTestId('nominal-case').innerText(), /Peak brake temperature/);
    const chart = assessment.getByRole('img', { name: /What moves the peak brake temperature most/ });
    assert.ok((await chart.locator('rect').count()) >= 1, 'the chart has at least one bar');
    assert.ok(await chart.getByTestId('sensitivity-fade-line').count(), 'the chart draws the fade line');
    await assessment.scrollIntoViewIfNeeded();
    await screenshot(page, 'reviews-detail-assessment');

    const reviewId = new URL(page.url()).pathname.split('/').pop()!;
    const scenarioId = await page.evaluate(async (id) => {
      const response = await fetch(`/api/reviews/${id}`);
      return ((await response.json()) as { item: { scenarioId: string } }).item.scenarioId;
    }, reviewId);
    await page.goto(`${BASE_URL}/scenarios/${scenarioId}`);
    const result = page.getByTestId('descent-assessment');
    await result.waitFor();
    assert.match(await result.getByRole('heading', { level: 3 }).first().innerText(), /safety assessment/);
    assert.match(await result.getByTestId('worst-case').innerText(), /Critical|High/);
    await result.getByTestId('sensitivity-chart').waitFor();
    await result.getByText('The figures').click();
    assert.ok((await result.getByTestId('sensitivity-table').getByRole('row').count()) >= 2, 'the table repeats the chart’s figures');
    await result.scrollIntoViewIfNeeded();
    await screenshot(page, 'scenario-result-assessment');
  });

  it('records a mitigation only when its re-run brings the risk to elevated or lower, and shows the new risk and the audit event', async () => {
    const { page } = browser;
    await openQueue(page);
    await openHighRiskItem(page);
    await page.locator('app-terrain-map .leaflet-tile-loaded').first().waitFor({ state: 'attached' });
    await tallScreenshot(page, 'reviews-detail-safety');
    await bringToInReview(page);
    const eventsBefore = await page.getByTestId('audit-event').count();

    await page.getByRole('button', { name: 'Record mitigation' }).click();
    const form = page.getByRole('form', { name: 'Record mitigation' });
    await form.getByLabel('Vehicle restriction').fill('Midibuses only on the pass');
    await form.getByRole('button', { name: 'Re-run and save mitigation' }).click();
    // A restriction alone is not modelled: the form points to a risk acceptance instead.
    assert.match(await page.getByTestId('no-measure').innerText(), /propose accepting the risk/);
    await form.getByLabel('Descent speed cap').fill('10');
    await form.getByLabel('SOC ceiling at the top').fill('30');
    await form.getByLabel('Note').fill('10 km/h signs and a depot charge limit on the pass descent');
    await screenshot(page, 'reviews-mitigation-form');
    await form.getByRole('button', { name: 'Re-run and save mitigation' }).click();

    const outcome = await Promise.race([
      page
        .getByTestId('current-state')
        .getByText('Mitigated')
        .waitFor()
        .then(() => 'mitigated' as const),
      page
        .getByRole('alert')
        .filter({ hasText: 'still gives' })
        .waitFor()
        .then(() => 'refused' as const),
    ]);
    if (outcome === 'refused') {
      // The re-run stays above elevated: nothing is recorded and the item stays in review.
      assert.match(await page.getByRole('alert').filter({ hasText: 'still gives' }).innerText(), /still gives (high|critical) risk/);
      assert.match(await page.getByTestId('current-state').innerText(), /In review/);
      assert.equal(await page.getByTestId('audit-event').count(), eventsBefore);
      await screenshot(page, 'reviews-mitigation-refused');
      return;
    }
    const result = page.getByTestId('rerun-result');
    await result.waitFor();
    const rerun = /With the mitigation, the re-run gives\s+Risk: (Low|Elevated|High|Critical)/.exec(await result.innerText());
    assert.ok(rerun, await result.innerText());
    assert.match(rerun[1]!, /^(Low|Elevated)$/);
    // The header shows the risk that stands now, the mitigated one.
    assert.match(await page.getByTestId('current-risk').innerText(), new RegExp(`^Risk with mitigation: ${rerun[1]}$`));
    await page.getByTestId('audit-event').nth(eventsBefore).waitFor();
    const lastEventText = await page.getByTestId('audit-event').last().innerText();
    assert.match(lastEventText, /Ilse Rautenberg/);
    assert.match(lastEventText, /In review[\s\S]*Mitigated/);
    assert.match(lastEventText, /Descent speed cap\s*10 km\/h/);
    assert.match(lastEventText, /Risk before\s*(High|Critical)/);
    await tallScreenshot(page, 'reviews-detail-after-mitigation');
  });

  it('proposes a risk acceptance that waits for a second safety officer, who signs it off', async () => {
    const { page } = browser;
    await openQueue(page);
    await openHighRiskItem(page);
    await bringToInReview(page);

    await page.getByRole('button', { name: 'Propose risk acceptance' }).click();
    await page
      .getByRole('form', { name: 'Propose risk acceptance' })
      .getByLabel('Reason')
      .fill('Midibuses with retarders only on this line from the winter timetable');
    await page.getByRole('button', { name: 'Propose acceptance', exact: true }).click();
    await page.getByTestId('current-state').getByText('Acceptance awaiting sign-off').waitFor();

    assert.equal(await page.getByRole('button', { name: 'Sign off acceptance' }).count(), 0, 'the proposer cannot sign off');
    assert.match(await page.getByTestId('awaiting-second-officer').innerText(), /Another safety officer must sign it off/);
    await tallScreenshot(page, 'reviews-acceptance-awaiting-sign-off');

    const second = await openBrowser();
    try {
      await signInAsSecondSafetyOfficer(second.page);
      await second.page.goto(page.url());
      await second.page.getByRole('button', { name: 'Sign off acceptance' }).click();
      await second.page.getByTestId('current-state').getByText('Risk accepted').waitFor();
      assert.match(await second.page.getByTestId('acceptance').innerText(), /Risk accepted:\s*Midibuses with retarders/);
      assert.match(await second.page.locator('.signatures').innerText(), /Proposed by Ilse Rautenberg[\s\S]*Signed off by Tomas Venzl/);
      await tallScreenshot(second.page, 'reviews-acceptance-signed-off');
      await signOut(second.page);
    } finally {
      await second.close();
    }
  });
});

/** Brings the open item to "In review" whatever earlier runs left it in. */
async function bringToInReview(page: Page): Promise<void> {
  const state = await page.getByTestId('current-state').innerText();
  if (/Mitigated|Risk accepted/.test(state)) {
    await page.getByRole('button', { name: 'Reopen' }).click();
    await page.getByRole('form', { name: 'Reopen' }).getByLabel('Note').fill('Looking at the decision again in the browser test');
    await page.getByRole('button', { name: 'Reopen item' }).click();
    await page.getByTestId('current-state').getByText('Reopened').waitFor();
  }
  if (/awaiting sign-off/.test(state)) {
    await page.getByRole('button', { name: 'Send back' }).click();
    await page.getByRole('form', { name: 'Send back' }).getByLabel('Note').fill('Sent back by the browser test');
    await page.getByRole('button', { name: 'Send back to review' }).click();
    await page.getByTestId('current-state').getByText('In review').waitFor();
  }
  if (!/In review/.test(await page.getByTestId('current-state').innerText())) {
    await page.getByRole('button', { name: 'Acknowledge' }).click();
    await page.getByTestId('current-state').getByText('In review').waitFor();
  }
}

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

    for (const name of ['Acknowledge', 'Record mitigation', 'Propose risk acceptance', 'Sign off acceptance', 'Reopen']) {
      assert.equal(await page.getByRole('button', { name }).count(), 0, `no "${name}" button`);
    }
    assert.match(await page.getByText('Only safety officers can change a review item').innerText(), /follow every decision/);
    assert.match(await page.getByLabel('Engineering caution').innerText(), /Engineering estimates/);
  });
});
