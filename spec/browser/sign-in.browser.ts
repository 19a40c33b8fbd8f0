import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import { BASE_URL, assertServerIsUp, openBrowser, screenshot, settleAnimations, type BrowserSession } from './support/browser';
import { ROLE_EXPECTATIONS, demoEmail, navigationLabels, signInAs, signOut, type DemoRole } from './support/demo-people';

describe('signing in and out', () => {
  let browser: BrowserSession;

  before(async () => {
    await assertServerIsUp();
    browser = await openBrowser();
  });

  after(async () => {
    await browser?.close();
  });

  it('shows an error and stays on the sign-in page when the password is wrong', async () => {
    const { page } = browser;

    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByLabel('E-mail address').fill(demoEmail('planner'));
    await page.getByLabel('Password', { exact: true }).fill('not-the-demo-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    const alert = page.getByRole('alert');
    await alert.waitFor();
    await screenshot(page, 'sign-in-wrong-password');

    assert.match(await alert.innerText(), /e-mail address or the password is not right/);
    assert.equal(new URL(page.url()).pathname, '/sign-in');
  });

  it('sends someone who is not signed in to the sign-in page, keeping the address', async () => {
    const { page } = browser;

    await page.goto(`${BASE_URL}/admin/people`);
    await page.getByRole('heading', { level: 1, name: 'Sign in', exact: true }).waitFor();

    const url = new URL(page.url());
    assert.equal(url.pathname, '/sign-in');
    assert.equal(url.searchParams.get('returnUrl'), '/admin/people');
  });

  for (const role of Object.keys(ROLE_EXPECTATIONS) as DemoRole[]) {
    it(`signs in the ${role}, shows that role's home and only its navigation, then signs out`, async () => {
      const { page } = browser;
      const expected = ROLE_EXPECTATIONS[role];

      await signInAs(page, role);
      await screenshot(page, `home-${role}`);

      assert.equal(await page.getByRole('heading', { level: 1 }).innerText(), expected.homeHeading);
      assert.deepEqual(await navigationLabels(page), expected.navigation);
      assert.match(await page.getByTestId('signed-in-person').innerText(), /\S+/);

      await signOut(page);
      assert.equal(new URL(page.url()).pathname, '/sign-in');
      await page.goto(`${BASE_URL}/`);
      await page.getByRole('heading', { level: 1, name: 'Sign in', exact: true }).waitFor();
    });
  }

  it('keeps an area out of reach of a role that may not open it', async () => {
    const { page } = browser;

    await signInAs(page, 'board');
    await page.goto(`${BASE_URL}/admin/people`);
    await page.getByRole('heading', { level: 1, name: 'Page not found', exact: true }).waitFor();

    await signOut(page);
  });
});

describe('the shell on a tablet', () => {
  let browser: BrowserSession;

  before(async () => {
    browser = await openBrowser({ width: 768, height: 1024 });
  });

  after(async () => {
    await browser?.close();
  });

  it('opens the side navigation as an overlay from the top bar', async () => {
    const { page } = browser;

    await signInAs(page, 'admin');
    const navigation = page.getByRole('navigation', { name: 'Main' });
    assert.equal(await navigation.isVisible(), false);

    await page.getByRole('button', { name: 'Open navigation' }).click();
    await navigation.getByRole('link', { name: 'People' }).waitFor();
    await settleAnimations(page);
    await screenshot(page, 'tablet-navigation-open');
    await navigation.getByRole('link', { name: 'People' }).click();
    await page.getByRole('heading', { level: 1, name: 'People', exact: true }).waitFor();
    await settleAnimations(page);
    assert.equal(await navigation.isVisible(), false, 'the overlay closes after choosing an area');
    await screenshot(page, 'tablet-people');

    await signOut(page);
  });
});
