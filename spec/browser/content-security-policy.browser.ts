import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { Page } from 'playwright-core';
import { BASE_URL, assertServerIsUp, openBrowser } from './support/browser';
import { signInAs, type DemoRole } from './support/demo-people';

/**
 * Every page, as every role, under the Content-Security-Policy the server sends: Chromium reports
 * each violation (a refused inline script or style, a blocked font or image) as a
 * `securitypolicyviolation` event and on the console; there must be none.
 */
describe('Content-Security-Policy (issue 11)', () => {
  it('lets every page load with no policy violation, signed out and as every role', async () => {
    await assertServerIsUp();
    const violations: string[] = [];

    const anonymous = await openBrowser();
    try {
      watchViolations(anonymous.page, 'signed out', violations);
      const policy = (await anonymous.page.goto(`${BASE_URL}/sign-in`))?.headers()['content-security-policy'] ?? '';
      assert.match(policy, /frame-ancestors 'none'/);
      assert.doesNotMatch(policy, /unsafe-inline/);
      await anonymous.page.getByRole('heading', { level: 1, name: 'Sign in', exact: true }).waitFor();
      for (const path of ['/forgot-password', '/accept-invite?token=not-a-token', '/reset-password?token=not-a-token']) {
        await visit(anonymous.page, path);
      }
    } finally {
      await anonymous.close();
    }

    // Each page once, by the first role here that may use it (a page's components, and so its
    // styles, are the same for every role); every role's home page and shell too.
    const visited = new Set<string>();
    for (const role of ['admin', 'analyst', 'planner', 'safety', 'board'] as const satisfies readonly DemoRole[]) {
      const session = await openBrowser();
      try {
        watchViolations(session.page, role, violations);
        await signInAs(session.page, role);
        for (const path of await pagesFor(session.page, role)) {
          if (visited.has(path)) continue;
          visited.add(path);
          await visit(session.page, path);
        }
      } finally {
        await session.close();
      }
    }

    assert.deepEqual(violations, []);
  });
});

// Helpers

/** The pages a role uses: its navigation, the editors it may open, the first item of each list. */
async function pagesFor(page: Page, role: DemoRole): Promise<string[]> {
  const firstId = async (path: string): Promise<string | undefined> => {
    const response = await page.request.get(`${BASE_URL}${path}`);
    if (!response.ok()) return undefined;
    const body = (await response.json()) as { items?: { id: string }[] };
    return body.items?.[0]?.id;
  };
  const route = await firstId('/api/routes');
  const scenario = await firstId('/api/scenarios');
  const vehicle = await firstId('/api/vehicles');
  const review = await firstId('/api/reviews');
  const run = await firstId('/api/batch-runs');
  const editsScenarios = role === 'planner' || role === 'analyst';
  return [
    `/?as=${role}`,
    '/routes',
    ...(role === 'planner' ? ['/routes/new'] : []),
    ...(route ? [`/routes/${route}`] : []),
    '/scenarios',
    ...(editsScenarios ? ['/scenarios/new'] : []),
    ...(scenario ? [`/scenarios/${scenario}`] : []),
    ...(scenario && editsScenarios ? [`/scenarios/${scenario}/edit`] : []),
    '/vehicles',
    ...(role === 'analyst' ? ['/vehicles/new'] : []),
    ...(vehicle ? [`/vehicles/${vehicle}`] : []),
    '/reviews',
    ...(review ? [`/reviews/${review}`] : []),
    '/board',
    ...(role === 'analyst' ? ['/batch-runs', ...(run ? [`/batch-runs/${run}`] : [])] : []),
    ...(role === 'analyst' || role === 'admin' ? ['/terrain'] : []),
    ...(role === 'admin' ? ['/admin/people', '/admin/mail', '/admin/network', '/admin/audit'] : []),
    ...(role === 'planner' || role === 'analyst' || role === 'admin' ? ['/deleted'] : []),
    '/no-such-page',
  ];
}

/** Opens a page and lets it settle: its components rendered, map tiles and charts drawn. */
async function visit(page: Page, path: string): Promise<void> {
  await page.goto(`${BASE_URL}${path}`);
  // A page heading, or the message a page shows a role that may not use it.
  await page
    .locator('h1, [role="alert"]')
    .first()
    .waitFor()
    .catch(() => {
      throw new Error(`${path} shows neither a heading nor a message`);
    });
  // Map tiles, fonts and charts arrive after the heading; violations they cause arrive with them.
  await page.waitForTimeout(750);
}

function watchViolations(page: Page, who: string, violations: string[]): void {
  page.on('console', (message) => {
    if (/Content Security Policy|Content-Security-Policy/i.test(message.text())) violations.push(`${who} ${page.url()}: ${message.text()}`);
  });
  void page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (event) => {
      console.error(
        `Content Security Policy violation: ${event.violatedDirective} blocked ${event.blockedURI || 'inline'} (${event.sample})`,
      );
    });
  });
}
