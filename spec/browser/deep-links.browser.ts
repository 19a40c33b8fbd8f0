import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { BASE_URL, screenshot } from './support/browser';
import { signedInBrowser } from './support/demo-people';
import { PageWatch } from './support/page-watch';

/** Addresses a person types or bookmarks land on a sensible screen, with no failed request. */
describe('deep links', () => {
  const browser = signedInBrowser('board');

  it('explains who may create or change, instead of asking the API for an item called "new" or showing "Page not found"', async () => {
    const { page } = browser;
    const watch = new PageWatch(page);
    try {
      for (const [path, heading, who] of [
        ['/vehicles/new', 'New vehicle profile', /Only energy & terrain analysts can create vehicle profiles/],
        ['/routes/new', 'New route', /Only transit planners can draw new routes/],
        ['/scenarios/new', 'New scenario', /Only transit planners and energy & terrain analysts can create scenarios/],
        [
          '/scenarios/3a5d4046-48a5-4a78-ac98-8552c9ff0ac7/edit',
          'Edit scenario',
          /Only transit planners and energy & terrain analysts can change scenarios/,
        ],
        [
          '/service-days/3a5d4046-48a5-4a78-ac98-8552c9ff0ac7/edit',
          'Edit service day',
          /Only energy & terrain analysts and administrators can change service days/,
        ],
      ] as const) {
        await page.goto(`${BASE_URL}${path}`);
        await page.getByRole('heading', { level: 1, name: heading, exact: true }).waitFor();
        assert.match(await page.getByTestId('role-required').innerText(), who);
      }
      await screenshot(page, 'deep-link-role-required');
      await page.waitForLoadState('networkidle');
      assert.deepEqual(watch.take(), []);
    } finally {
      watch.stop();
    }
  });

  it('asks for a choice on the compare page opened without scenarios', async () => {
    const { page } = browser;
    const watch = new PageWatch(page);
    try {
      await page.goto(`${BASE_URL}/scenarios/compare`);
      await page.getByTestId('compare-choose').waitFor();
      await page.getByRole('link', { name: /Choose scenarios/ }).click();
      await page.waitForURL(`${BASE_URL}/scenarios`);
      assert.deepEqual(watch.take(), []);
    } finally {
      watch.stop();
    }
  });

  it('shows "Page not found" for an id that cannot exist, without a request', async () => {
    const { page } = browser;
    const watch = new PageWatch(page);
    try {
      for (const path of ['/vehicles/newest', '/scenarios/abc/edit', '/reviews/123']) {
        await page.goto(`${BASE_URL}${path}`);
        await page.getByRole('heading', { level: 1, name: 'Page not found' }).waitFor();
      }
      assert.deepEqual(watch.take(), []);
    } finally {
      watch.stop();
    }
  });
});
