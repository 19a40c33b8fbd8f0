import { after, before } from 'node:test';
import type { Page } from 'playwright-core';
import { BASE_URL, assertServerIsUp, openBrowser, type BrowserSession } from './browser';

/** The demo password the API's seed gives every demo person. */
export const DEMO_PASSWORD = 'descend-safely-2026';

export type DemoRole = 'planner' | 'analyst' | 'safety' | 'board' | 'admin';

/**
 * What each role must see: the heading of its home page and exactly its side-navigation
 * entries. A feature that adds an area for a role adds its label here too.
 */
const EVERY_ROLE_SEES = ['Home', 'Routes', 'Descent review', 'Network summary', 'Scenarios', 'Service days', 'Vehicle profiles'];

export const ROLE_EXPECTATIONS: Readonly<Record<DemoRole, { homeHeading: string; navigation: string[] }>> = {
  planner: { homeHeading: 'Routes and scenarios', navigation: [...EVERY_ROLE_SEES, 'Recently deleted'] },
  analyst: {
    homeHeading: 'Terrain and vehicle profiles',
    navigation: [
      'Home',
      'Routes',
      'Descent review',
      'Network summary',
      'Network runs',
      'Scenarios',
      'Service days',
      'Vehicle profiles',
      'Terrain',
      'Base map',
      'Recently deleted',
    ],
  },
  safety: { homeHeading: 'Descent review', navigation: EVERY_ROLE_SEES },
  board: { homeHeading: 'Network summary', navigation: EVERY_ROLE_SEES },
  admin: {
    homeHeading: 'People and outgoing mail',
    navigation: [...EVERY_ROLE_SEES, 'Terrain', 'Base map', 'Recently deleted', 'People', 'Outgoing mail', 'Audit log', 'Network settings'],
  },
};

export function demoEmail(role: DemoRole): string {
  return `${role}@descentry.example`;
}

/** The demo's second safety officer, who signs off risk acceptances the first one proposes. */
export const SECOND_SAFETY_EMAIL = 'second.safety@descentry.example';

/** Signs the second safety officer in through the sign-in page (home: the descent review). */
export async function signInAsSecondSafetyOfficer(page: Page): Promise<void> {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByLabel('E-mail address').fill(SECOND_SAFETY_EMAIL);
  await page.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('heading', { level: 1, name: ROLE_EXPECTATIONS.safety.homeHeading, exact: true }).waitFor();
}

/** Signs in through the sign-in page and waits for the home page. */
export async function signInAs(page: Page, role: DemoRole, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByLabel('E-mail address').fill(demoEmail(role));
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('heading', { level: 1, name: ROLE_EXPECTATIONS[role].homeHeading, exact: true }).waitFor();
}

/** Signs out through the account menu and waits for the sign-in page. */
export async function signOut(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Account menu' }).click();
  await page.getByRole('menuitem', { name: 'Sign out' }).click();
  await page.getByRole('heading', { level: 1, name: 'Sign in', exact: true }).waitFor();
}

/** The labels of the main navigation's links, in order. */
export async function navigationLabels(page: Page): Promise<string[]> {
  const links = page.getByRole('navigation', { name: 'Main' }).getByRole('link');
  return (await links.allInnerTexts()).map((text) => text.replace(/^\S+\s*\n?/, '').trim());
}

/**
 * A browser signed in as `role` for the enclosing `describe` block: opened in `before`, signed out
 * and closed in `after`. Read `page` inside the tests, once the block has started.
 */
export function signedInBrowser(role: DemoRole, viewport?: { width: number; height: number }): { readonly page: Page } {
  let session: BrowserSession | undefined;
  before(async () => {
    await assertServerIsUp();
    session = await openBrowser(viewport);
    await signInAs(session.page, role);
  });
  after(async () => {
    if (session) await signOut(session.page).catch(() => undefined);
    await session?.close();
  });
  return {
    get page() {
      if (!session) throw new Error(`The browser for ${role} is not open yet`);
      return session.page;
    },
  };
}
