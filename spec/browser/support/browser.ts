import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Locator, type Page } from 'playwright-core';

/** Where the app under test runs: `npm start` serves web and API together on port 4300. */
export const BASE_URL = (process.env['BASE_URL'] ?? 'http://127.0.0.1:4300').replace(/\/$/, '');

/** Git-ignored; look at these after a run. */
export const SCREENSHOT_DIR = join(process.cwd(), 'spec-artifacts', 'screenshots');

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  close(): Promise<void>;
}

/**
 * A fresh Chromium profile per test file, launched the way Debian's chromium works headless
 * here: a persistent context on a new temporary folder (Chromium refuses --user-data-dir
 * among the launch arguments), no sandbox, no GPU, no background networking. Nothing outside BASE_URL is contacted.
 */
export async function openBrowser(viewport = { width: 1280, height: 800 }): Promise<BrowserSession> {
  const profileDir = mkdtempSync(join(tmpdir(), 'descentry-browser-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: process.env['CHROMIUM_PATH'] ?? '/usr/bin/chromium',
    headless: true,
    viewport,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  context.setDefaultTimeout(15_000);
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    async close() {
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/** Saves a full-page PNG as spec-artifacts/screenshots/<name>.png. */
export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  await page.screenshot({ path: join(SCREENSHOT_DIR, `${name}.png`), fullPage: true });
}

/** Waits for running CSS animations (a sliding side navigation) to end before a screenshot. */
export async function settleAnimations(page: Page): Promise<void> {
  await page.waitForFunction(() => document.getAnimations().every((animation) => animation.playState !== 'running'));
}

/**
 * Waits until a locator matches `expected` elements (or `predicate` holds for the count).
 * Map layers and tables change a frame or two after the click that changes them, so a
 * count read at once can still see the old state.
 */
export async function waitForCount(locator: Locator, predicate: number | ((count: number) => boolean), timeoutMs = 5_000): Promise<number> {
  const holds = typeof predicate === 'number' ? (count: number) => count === predicate : predicate;
  const deadline = Date.now() + timeoutMs;
  let count = await locator.count();
  while (!holds(count)) {
    if (Date.now() > deadline) {
      throw new Error(`${locator} matched ${count} elements after ${timeoutMs} ms, not ${String(predicate)}`);
    }
    await new Promise((resolve) => setTimeout(resolve, 50));
    count = await locator.count();
  }
  return count;
}

/**
 * Turns a Material slide toggle (role "switch") on or off and waits until it shows the new state.
 * The toggle's aria-checked follows on the next change detection, not within the click, so
 * Playwright's check()/uncheck() can read the old state under load and give up.
 */
export async function setSwitch(toggle: Locator, on: boolean, timeoutMs = 5_000): Promise<void> {
  const wanted = String(on);
  if ((await toggle.getAttribute('aria-checked')) === wanted) return;
  await toggle.click();
  const deadline = Date.now() + timeoutMs;
  while ((await toggle.getAttribute('aria-checked')) !== wanted) {
    if (Date.now() > deadline) throw new Error(`${toggle} still shows aria-checked=${String(!on)} ${timeoutMs} ms after the click`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

/** Fails fast, with a useful message, when nothing answers at BASE_URL. */
export async function assertServerIsUp(): Promise<void> {
  try {
    const response = await fetch(`${BASE_URL}/api/health`);
    if (!response.ok) throw new Error(`GET /api/health answered ${response.status}`);
  } catch (error: unknown) {
    // Expected when the server was not started: say how to start it instead of timing out.
    throw new Error(
      `Descentry is not reachable at ${BASE_URL} (${String(error)}). Start it with \`npm start\` ` +
        'or point BASE_URL at a running instance.',
    );
  }
}
