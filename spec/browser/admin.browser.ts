import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { Locator } from 'playwright-core';
import { BASE_URL, openBrowser, screenshot, settleAnimations } from './support/browser';
import { demoEmail, signedInBrowser } from './support/demo-people';
import { latestMailBodyTo } from './support/mail-inbox';

describe('administration', () => {
  const browser = signedInBrowser('admin');
  const invitee = {
    email: `browser-check-${Date.now()}@descentry.example`,
    name: 'Petra Lindqvist',
    acceptPath: '',
  };

  it('lists the demo people on the People page and filters them', async () => {
    const { page } = browser;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' }).click();
    await page.getByRole('heading', { level: 1, name: 'People', exact: true }).waitFor();
    const table = page.getByRole('table', { name: 'People' });
    // A cell reads "name e-mail"; the second safety officer's address ends in the first one's.
    const personCell = (email: string) => table.getByRole('cell', { name: new RegExp(`(^|\\s)${email.replaceAll('.', '\\.')}$`) });
    await personCell(demoEmail('safety')).waitFor();
    await screenshot(page, 'admin-people');

    for (const role of ['planner', 'analyst', 'safety', 'board', 'admin'] as const) {
      assert.equal(await personCell(demoEmail(role)).count(), 1, role);
    }

    await page.getByLabel('Search name or e-mail').fill('safety@');
    await table.getByRole('cell', { name: demoEmail('planner') }).waitFor({ state: 'detached' });
    assert.equal(await table.getByRole('row').count(), 3); // header + the two safety officers
  });

  it('invites a person, who then appears in the table as invited', async () => {
    const { page } = browser;

    await page.getByLabel('Search name or e-mail').fill('');
    await page.getByRole('button', { name: 'Invite a person' }).click();
    const dialog = page.getByRole('dialog', { name: 'Invite a person' });
    await dialog.waitFor();
    // Type only once the dialog has finished opening and moved focus into its first field;
    // typing during the opening animation can lose keystrokes on a busy machine.
    await settleAnimations(page);
    await fillAndCheck(dialog.getByLabel('E-mail address'), invitee.email);
    await fillAndCheck(dialog.getByLabel('Name'), invitee.name);
    await dialog.getByRole('combobox', { name: 'Role' }).click();
    await page.getByRole('option', { name: 'Safety officer' }).click();
    await settleAnimations(page);
    await screenshot(page, 'admin-invite-dialog');
    await dialog.getByRole('button', { name: 'Send invitation' }).click();
    await dialog.waitFor({ state: 'detached' });

    const row = page.getByRole('row', { name: new RegExp(invitee.email) });
    await row.waitFor();
    assert.match(await row.innerText(), /Invited/);
  });

  it('shows the outbox and the mail catcher on Outgoing mail', async () => {
    const { page } = browser;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outgoing mail' }).click();
    await page.getByRole('heading', { level: 1, name: 'Outgoing mail', exact: true }).waitFor();
    const outbox = page.getByRole('table', { name: 'Outbox' });
    await outbox.getByRole('cell', { name: invitee.email }).waitFor();
    await screenshot(page, 'admin-outgoing-mail');

    assert.match(await outbox.getByRole('row', { name: new RegExp(invitee.email) }).innerText(), /You are invited/);

    await page.getByRole('tab', { name: 'Local mail catcher' }).click();
    const invitation = page.getByRole('button', { name: new RegExp(`To ${invitee.email}`) });
    // The outbox worker delivers within seconds; refresh until the catcher has the message.
    for (let attempt = 0; attempt < 20 && !(await invitation.isVisible()); attempt += 1) {
      await page.waitForTimeout(500);
      await page.getByRole('button', { name: 'Refresh' }).click();
    }
    await invitation.click();
    const body = page.getByTestId('captured-body');
    await body.waitFor();
    await settleAnimations(page);
    await screenshot(page, 'admin-mail-catcher');

    // The administrator sees the link with its token hidden; the invitee's own copy has it.
    assert.match(await body.innerText(), /\/accept-invite\?token=••••••/);
    const link = /\/accept-invite\?token=[\w-]+/.exec((await latestMailBodyTo(invitee.email)) ?? '');
    assert.ok(link, 'the invitation carries an accept-invite link');
    invitee.acceptPath = link[0];
    await page.getByRole('button', { name: 'Refresh' }).click();
    assert.equal(await page.getByRole('alert').count(), 0);
  });

  it('lets the invited person choose a password from the e-mailed link and sign in', async () => {
    assert.ok(invitee.acceptPath, 'needs the link from the previous test');
    const newcomer = await openBrowser();
    try {
      const { page } = newcomer;
      const password = 'tarn-col-switchback-42';

      await page.goto(`${BASE_URL}${invitee.acceptPath}`);
      await page.getByText(`Welcome, ${invitee.name}.`).waitFor();
      await page.getByLabel('New password', { exact: true }).fill('short');
      assert.match(await page.getByTestId('password-strength').innerText(), /at least 12 characters/);
      await page.getByLabel('New password', { exact: true }).fill(password);
      await page.getByLabel('Repeat the new password').fill(password);
      await screenshot(page, 'accept-invite');
      await page.getByRole('button', { name: 'Create account' }).click();
      await page.getByRole('heading', { level: 1, name: 'Sign in', exact: true }).waitFor();
      assert.match(await page.getByRole('status').first().innerText(), /Your account is ready/);

      await page.getByLabel('E-mail address').fill(invitee.email);
      await page.getByLabel('Password', { exact: true }).fill(password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('heading', { level: 1, name: 'Descent review', exact: true }).waitFor();

      await page.goto(`${BASE_URL}${invitee.acceptPath}`);
      await page.getByTestId('token-problem').waitFor();
      assert.match(await page.getByTestId('token-problem').innerText(), /expired or was already used|not valid/);
    } finally {
      await newcomer.close();
    }
  });
});

// Helpers

/** Fills a field and checks the value took, filling again once if the page swallowed it. */
async function fillAndCheck(field: Locator, value: string): Promise<void> {
  await field.fill(value);
  if ((await field.inputValue()) !== value) await field.fill(value);
  assert.equal(await field.inputValue(), value);
}
