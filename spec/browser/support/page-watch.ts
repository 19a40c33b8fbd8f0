import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page, Request, Response } from 'playwright-core';

/** Plain JavaScript, evaluated as text so the test runner's transforms never reach the page. */
const OVERFLOW_PROBE = readFileSync(join(import.meta.dirname, 'overflow-probe.js'), 'utf8');

/** One thing a page did that a person would call broken. */
export interface PageProblem {
  kind: 'console error' | 'uncaught exception' | 'failed request' | 'aborted request';
  detail: string;
}

/**
 * Watches a page for console errors, uncaught exceptions and API answers of 4xx/5xx, from the
 * moment it is created until `stop()`. `take()` returns what was seen since the last call and
 * forgets it, so a test can check one step at a time.
 */
export class PageWatch {
  private problems: PageProblem[] = [];
  private inFlight = 0;
  private lastActivity = Date.now();
  private readonly onRequest = () => {
    this.inFlight++;
    this.lastActivity = Date.now();
  };
  private readonly onRequestDone = () => {
    this.inFlight = Math.max(0, this.inFlight - 1);
    this.lastActivity = Date.now();
  };
  private readonly onConsole = (message: { type(): string; text(): string; location(): { url: string } }) => {
    if (message.type() === 'error') {
      this.problems.push({ kind: 'console error', detail: `${message.text()} (${message.location().url})` });
    }
  };
  private readonly onPageError = (error: Error) => {
    this.problems.push({ kind: 'uncaught exception', detail: error.stack ?? error.message });
  };
  private readonly onResponse = (response: Response) => {
    if (response.status() >= 400) {
      this.problems.push({
        kind: 'failed request',
        detail: `${response.request().method()} ${pathOf(response.url())} ${response.status()}`,
      });
    }
  };
  private readonly onRequestFailed = (request: Request) => {
    this.onRequestDone();
    this.problems.push({
      kind: 'aborted request',
      detail: `${request.method()} ${pathOf(request.url())} ${request.failure()?.errorText ?? ''}`,
    });
  };

  constructor(private readonly page: Page) {
    page.on('console', this.onConsole);
    page.on('pageerror', this.onPageError);
    page.on('response', this.onResponse);
    page.on('requestfailed', this.onRequestFailed);
    page.on('request', this.onRequest);
    page.on('requestfinished', this.onRequestDone);
  }

  /**
   * Resolves once no request has been in flight for `quietMs` (playwright's "networkidle" waits
   * 500 ms and only after a full page load; this also covers in-app navigation).
   */
  async idle(quietMs = 150, timeoutMs = 15_000): Promise<void> {
    const deadline = Date.now() + timeoutMs;
    while (Date.now() < deadline) {
      if (this.inFlight === 0 && Date.now() - this.lastActivity >= quietMs) return;
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    throw new Error(`The page still had ${this.inFlight} request(s) in flight after ${timeoutMs} ms`);
  }

  /** What was seen since the last call (aborted requests only when asked: leaving a page cancels them). */
  take({ includeAborted = false } = {}): PageProblem[] {
    const seen = this.problems.filter((problem) => includeAborted || problem.kind !== 'aborted request');
    this.problems = [];
    return seen;
  }

  stop(): void {
    this.page.off('console', this.onConsole);
    this.page.off('pageerror', this.onPageError);
    this.page.off('response', this.onResponse);
    this.page.off('requestfailed', this.onRequestFailed);
  }
}

function pathOf(url: string): string {
  const parsed = new URL(url);
  return `${parsed.pathname}${parsed.search}`;
}

/** One piece of text that does not fit where it is shown. */
export interface OverflowProblem {
  text: string;
  where: string;
  how: string;
}

/**
 * Finds text a person cannot read whole at the current width: the page itself scrolling sideways,
 * text cut off by its box (ellipsis or hidden overflow), or text running past the edge of the
 * window. A horizontally scrolling box is allowed only when it shows that it scrolls (the shared
 * `app-table-frame` wrapper draws a shadow on the side that hides more); the map's own panes and
 * chart canvases are not text and are skipped.
 */
export async function findOverflowingText(page: Page): Promise<OverflowProblem[]> {
  return page.evaluate(OVERFLOW_PROBE) as Promise<OverflowProblem[]>;
}
