import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { BASE_URL, openBrowser, screenshot, settleAnimations } from './support/browser';
import { signInAs, signedInBrowser } from './support/demo-people';

/**
 * Deletes are restorable (issue 11): a planner deletes a route, finds it under Recently deleted
 * with who deleted it, and restores it; the administrator reads both changes in the audit log.
 */
describe('recently deleted and the audit log', () => {
  const browser = signedInBrowser('planner', { width: 1366, height: 900 });
  const routeName = `Route to restore ${Date.now()}`;

  it('lets a planner delete a route, find it under Recently deleted and restore it', async () => {
    const { page } = browser;
    const created = await page.request.post(`${BASE_URL}/api/routes`, {
      headers: { Origin: BASE_URL },
      data: {
        name: routeName,
        geometry: {
          type: 'LineString',
          coordinates: [
            [9.5, 46.5, 1200],
            [9.51, 46.5, 1180],
            [9.52, 46.5, 1150],
          ],
        },
      },
    });
    assert.equal(created.status(), 201);
    const route = (await created.json()) as { id: string };

    await page.goto(`${BASE_URL}/routes/${route.id}`);
    await page.getByRole('heading', { level: 1, name: routeName }).waitFor();
    await page.getByRole('button', { name: 'Delete', exact: true }).click();
    const dialog = page.getByRole('dialog', { name: `Delete the route “${routeName}”?` });
    await dialog.waitFor();
    await settleAnimations(page);
    assert.match(await dialog.innerText(), /restore it under Recently deleted for 30 days/);
    await screenshot(page, 'route-delete-dialog');
    await dialog.getByRole('button', { name: 'Delete route' }).click();
    await page.waitForURL(`${BASE_URL}/routes`);

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Recently deleted' }).click();
    await page.getByRole('heading', { level: 1, name: 'Recently deleted', exact: true }).waitFor();
    const row = page.getByRole('row', { name: new RegExp(routeName) });
    await row.waitFor();
    assert.match(await row.innerText(), /Mira Talvik/);
    await screenshot(page, 'recently-deleted');
    await row.getByRole('button', { name: `Restore ${routeName}` }).click();
    await row.waitFor({ state: 'detached' });

    await page.goto(`${BASE_URL}/routes/${route.id}`);
    await page.getByRole('heading', { level: 1, name: routeName }).waitFor();
  });

  it('shows the administrator who deleted and restored the route in the audit log', async () => {
    const admin = await openBrowser({ width: 1366, height: 900 });
    try {
      await signInAs(admin.page, 'admin');
      await admin.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Audit log' }).click();
      await admin.page.getByRole('heading', { level: 1, name: 'Audit log', exact: true }).waitFor();
      const table = admin.page.getByRole('table', { name: 'Audit log' });
      const restored = table.getByRole('row', { name: new RegExp(`Restored.*${routeName}`) });
      const deleted = table.getByRole('row', { name: new RegExp(`Deleted.*${routeName}`) });
      await restored.waitFor();
      await deleted.waitFor();
      await screenshot(admin.page, 'audit-log');
    } finally {
      await admin.close();
    }
  });
});
