import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import { assertServerIsUp, openBrowser, screenshot, type BrowserSession } from './support/browser';
import { demoEmail, signInAs, signOut } from './support/demo-people';

describe('administration', () => {
  let browser: BrowserSession;

  before(async () => {
    await assertServerIsUp();
    browser = await openBrowser();
    await signInAs(browser.page, 'admin');
  });

  after(async () => {
    if (browser) await signOut(browser.page).catch(() => undefined);
    await browser?.close();
  });

  it('lists the demo people on the People page and filters them', async () => {
    const { page } = browser;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' }).click();
    await page.getByRole('heading', { level: 1, name: 'People', exact: true }).waitFor();
    const table = page.getByRole('table', { name: 'People' });
    await table.getByRole('cell', { name: demoEmail('safety') }).waitFor();
    await screenshot(page, 'admin-people');

    for (const role of ['planner', 'analyst', 'safety', 'board', 'admin'] as const) {
      assert.equal(await table.getByRole('cell', { name: demoEmail(role) }).count(), 1, role);
    }

    await page.getByLabel('Search name or e-mail').fill('safety@');
    await table.getByRole('cell', { name: demoEmail('planner') }).waitFor({ state: 'detached' });
    assert.equal(await table.getByRole('row').count(), 2); // header + one person
  });

  it('opens the invite dialog with e-mail, name and role', async () => {
    const { page } = browser;

    await page.getByRole('button', { name: 'Invite a person' }).click();
    const dialog = page.getByRole('dialog', { name: 'Invite a person' });
    await dialog.waitFor();
    await screenshot(page, 'admin-invite-dialog');

    assert.equal(await dialog.getByLabel('E-mail address').count(), 1);
    assert.equal(await dialog.getByLabel('Name').count(), 1);
    assert.equal(await dialog.getByRole('combobox', { name: 'Role' }).count(), 1);
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    await dialog.waitFor({ state: 'detached' });
  });

  it('shows the outbox and the mail catcher on Outgoing mail', async () => {
    const { page } = browser;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outgoing mail' }).click();
    await page.getByRole('heading', { level: 1, name: 'Outgoing mail', exact: true }).waitFor();
    await page.getByRole('table', { name: 'Outbox' }).waitFor();
    await screenshot(page, 'admin-outgoing-mail');

    await page.getByRole('tab', { name: 'Received by the local mail catcher' }).click();
    await page.getByText('In development and test installations').waitFor();
    await screenshot(page, 'admin-mail-catcher');

    await page.getByRole('button', { name: 'Refresh' }).click();
    assert.equal(await page.getByRole('alert').count(), 0);
  });
});
