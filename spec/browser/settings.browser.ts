import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import { assertServerIsUp, openBrowser, screenshot, settleAnimations, type BrowserSession } from './support/browser';
import { signInAs, signOut } from './support/demo-people';

describe('settings', () => {
  let browser: BrowserSession;

  before(async () => {
    await assertServerIsUp();
    browser = await openBrowser();
  });

  after(async () => {
    await browser?.close();
  });

  it('lets a safety officer switch the high-risk descent e-mail off and on again', async () => {
    const { page } = browser;
    await signInAs(page, 'safety');

    await page.getByRole('button', { name: 'Account menu' }).click();
    await page.getByRole('menuitem', { name: 'Notification settings' }).click();
    const dialog = page.getByRole('dialog', { name: 'Notification settings' });
    const highRisk = dialog.getByRole('switch', { name: /New high-risk descent/ });
    await highRisk.waitFor();
    await settleAnimations(page);
    await screenshot(page, 'settings-notifications-safety');
    assert.match(await dialog.innerText(), /New high-risk descent\s*for your role/);
    const wasOn = (await highRisk.getAttribute('aria-checked')) === 'true';

    await highRisk.click();
    await dialog.getByRole('button', { name: 'Save' }).click();
    await dialog.waitFor({ state: 'detached' });
    await page.getByRole('button', { name: 'Account menu' }).click();
    await page.getByRole('menuitem', { name: 'Notification settings' }).click();
    await page.getByRole('dialog', { name: 'Notification settings' }).waitFor();
    await page.waitForFunction(() => !document.querySelector('mat-dialog-container mat-progress-bar'));
    const savedOn = (await page.getByRole('switch', { name: /New high-risk descent/ }).getAttribute('aria-checked')) === 'true';
    // Put it back as it was, so the demo keeps e-mailing safety officers.
    await page.getByRole('switch', { name: /New high-risk descent/ }).click();
    await page.getByRole('button', { name: 'Save' }).click();
    await page.getByRole('dialog', { name: 'Notification settings' }).waitFor({ state: 'detached' });

    assert.equal(savedOn, !wasOn);
    await signOut(page);
  });

  it('shows an administrator the network factors with their sources', async () => {
    const { page } = browser;
    await signInAs(page, 'admin');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Network settings' }).click();
    await page.getByRole('heading', { level: 1, name: 'Network settings', exact: true }).waitFor();
    await page.getByLabel('Source of the tariff').waitFor();
    await settleAnimations(page);
    await screenshot(page, 'settings-network-admin');

    assert.ok(Number(await page.getByLabel('Tariff per kWh').inputValue()) >= 0);
    assert.match(await page.getByLabel('Currency').inputValue(), /^[A-Z]{3}$/);
    assert.ok((await page.getByLabel('Source of the tariff').inputValue()).length > 0);
    assert.ok((await page.getByLabel('Source of the emission factor').inputValue()).length > 0);
    await page.getByLabel('Source of the tariff').fill('');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('Name the source.').waitFor();
    await signOut(page);
  });
});
