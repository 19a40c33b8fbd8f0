import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { Page } from 'playwright-core';
import { MARGIN_PT } from '../../api/pdf/pdf-layout';
import { RAW_VALUE_PATTERNS, readPdfWords, wordsOutsideMargins } from '../support/pdf-words';
import { BASE_URL, openBrowser, screenshot, settleAnimations } from './support/browser';
import { signInAs, signInAsSecondSafetyOfficer, signOut, signedInBrowser } from './support/demo-people';

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
    // The demo has service days in service: the headline year counts them, and the page says so.
    assert.match(await page.getByTestId('year-source').innerText(), /counted over the service days in service/);
    assert.match(await page.getByTestId('routes-lead').innerText(), /does not add up to the figures above/);
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

  it('shows an accepted high risk as its own figure, not as "0 open" alone (issue 10)', async () => {
    const { page } = browser;
    await acceptFirstHighRiskAsSafetyOfficer();

    await page.reload();
    const accepted = page.getByTestId('accepted-risks');
    await accepted.waitFor();

    assert.match(await accepted.innerText(), /^[1-9]\d*\s+High or critical risks accepted/);
    // Figures resting on the shipped placeholder tariff and grid factor say so where they are shown.
    assert.match(await page.getByTestId('figure-value').innerText(), /Placeholder factor, not a real figure/);
    assert.match(await page.getByTestId('figure-co2').innerText(), /Placeholder factor, not a real figure/);
    await screenshot(page, 'board-summary-accepted-risk');
  });

  it('downloads the summary as a one-page A4 PDF that reads as the page does', async () => {
    const { page } = browser;

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download PDF' }).click()]);
    const stream = await download.createReadStream();
    const chunks: Buffer[] = [];
    for await (const chunk of stream) chunks.push(chunk as Buffer);
    const pdf = readPdfWords(Buffer.concat(chunks));

    assert.match(download.suggestedFilename(), /\.pdf$/);
    assert.equal(pdf.pages.length, 1);
    assert.deepEqual(wordsOutsideMargins(pdf, MARGIN_PT), []);
    for (const raw of RAW_VALUE_PATTERNS) assert.doesNotMatch(pdf.text[0]!, raw);
    assert.match(pdf.text[0]!, /High or critical risks accepted: [1-9]/);
    assert.match(pdf.text[0]!, /Placeholder factor, not a real figure/);
  });
});

/**
 * A safety officer proposes accepting the demo's high-risk descent and the second one signs it
 * off (left as it is when already accepted).
 */
async function acceptFirstHighRiskAsSafetyOfficer(): Promise<void> {
  const list = await withSafetyOfficer(signInAs, async (page) => {
    // With the worst case, the demo's pass descents read critical rather than high.
    const answer = await page.request.get(`${BASE_URL}/api/reviews`);
    return ((await answer.json()) as { items: { id: string; state: string; risk: string }[] }).items.filter(
      (candidate) => candidate.risk === 'high' || candidate.risk === 'critical',
    );
  });
  const item = list[0];
  assert.ok(item, 'the demo has a high or critical descent');
  if (item.state === 'accepted') return;
  await withSafetyOfficer(signInAs, async (page) => {
    const transition = transitionOn(page, item.id);
    if (item.state === 'mitigated') await transition({ action: 'reopen', note: 'Board test: look at it again' });
    if (item.state === 'awaiting-sign-off') await transition({ action: 'decline', note: 'Board test: propose again' });
    if (item.state !== 'in-review' && item.state !== 'awaiting-sign-off') await transition({ action: 'acknowledge' });
    await transition({ action: 'accept', reason: 'Board test: retarder fitted and drivers briefed on the descent' });
  });
  await withSafetyOfficer(signInAsSecondSafetyOfficer, async (page) => {
    await transitionOn(page, item.id)({ action: 'sign-off' });
  });
}

async function withSafetyOfficer<T>(signIn: (page: Page, role: 'safety') => Promise<void>, work: (page: Page) => Promise<T>): Promise<T> {
  const safety = await openBrowser();
  try {
    await signIn(safety.page, 'safety');
    const result = await work(safety.page);
    await signOut(safety.page);
    return result;
  } finally {
    await safety.close();
  }
}

function transitionOn(page: Page, reviewId: string) {
  return async (data: Record<string, string>) => {
    const answer = await page.request.post(`${BASE_URL}/api/reviews/${reviewId}/transitions`, { data, headers: { origin: BASE_URL } });
    assert.equal(answer.status(), 200, await answer.text());
  };
}
