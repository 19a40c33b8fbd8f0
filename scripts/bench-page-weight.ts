/**
 * What a browser downloads: `node --import tsx scripts/bench-page-weight.ts [runs]` (needs
 * `npm run build`; starts a scratch instance of this checkout serving the built app, loads the
 * invented demo into it, then drives Debian's Chromium headless with playwright-core).
 *
 * For the sign-in page, the route editor (the demo's first route) and a scenario result (the
 * demo's first computed scenario), signed in as the demo planner where the page needs it:
 * - first visit: a fresh browser profile (empty cache) opens the page;
 * - repeat visit: a new tab of the same profile opens it again later (as after a restart of the
 *   browser: nothing in the memory cache of the tab, the disk cache as the first visit left it);
 * - after sign-in (pages that need a session): a fresh profile opens the sign-in page, then, signed
 *   in, the page in a new tab: a person's first visit of it, with what the sign-in page loaded
 *   (fonts, Angular's own scripts) in the browser's cache.
 * Bytes are what came over the wire (Chromium's encodedDataLength: headers and compressed bodies);
 * requests count everything the page asked for, those answered from the browser cache included;
 * LCP is the largest contentful paint the page reports. `runs` (default 3) of each; the table
 * gives the range. Loopback, so the figures are the server's and the browser's, not a network's.
 *
 * Before the measured visits the server shows each page once to a browser profile that is then
 * thrown away, so its tile cache is warm as on a server in use: "first visit" is the browser's.
 *
 * BENCH_BUSY=1 adds a column: how long the tab's main thread was busy (Chromium's tasks on the
 * renderer's main thread, from a trace of the visit) between the navigation and the largest
 * contentful paint. Traced visits are a little slower, so the default table is taken untraced.
 *
 * BENCH_FILES=1 also prints, for each page's first first visit, every file it transferred with
 * its size on the wire, largest first: where the bytes go.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext, type CDPSession } from 'playwright-core';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../api/demo/demo-people';
import { loadDemo, signIn, startScratchInstance } from './scratch-instance';

const RUNS = Number(process.argv[2] ?? 3);
const LIST_FILES = process.env['BENCH_FILES'] === '1';
const TRACE_BUSY = process.env['BENCH_BUSY'] === '1';
const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

interface Visit {
  bytes: number;
  /** Bytes of the app's own files (index.html, scripts, styles, fonts, images), of API answers and of map tiles. */
  appBytes: number;
  apiBytes: number;
  tileBytes: number;
  requests: number;
  fromCache: number;
  lcpMs: number;
  /** Milliseconds the renderer's main thread ran tasks before the largest contentful paint (BENCH_BUSY). */
  busyMs: number;
  /** Bytes on the wire per path (query left out), for BENCH_FILES. */
  files: Map<string, number>;
}

const instance = await startScratchInstance('descentry_bench_pages', { WEB_DIR: resolve('dist/web/browser') });
try {
  console.log('loading the demo into the scratch instance…');
  await loadDemo(instance);
  const planner = DEMO_PEOPLE.find((person) => person.role === 'planner')!;
  const cookie = sessionCookie(await signIn(instance, planner.email, DEMO_PASSWORD));
  const routes = (await getJson(instance.baseUrl, '/api/routes', cookie)) as { items: { id: string }[] };
  const scenarios = (await getJson(instance.baseUrl, '/api/scenarios', cookie)) as { items: { id: string; status: string }[] };
  const scenario = scenarios.items.find((item) => item.status === 'done');
  if (!routes.items[0] || !scenario) throw new Error('the demo has no route or no computed scenario');
  const pages = [
    { name: 'sign-in page', path: '/sign-in', signedIn: false },
    { name: 'route editor', path: `/routes/${routes.items[0].id}`, signedIn: true },
    { name: 'scenario result', path: `/scenarios/${scenario.id}`, signedIn: true },
  ];

  async function addSessionCookie(context: BrowserContext): Promise<void> {
    const [name, value] = cookie.split('=') as [string, string];
    await context.addCookies([{ name, value, url: instance.baseUrl, httpOnly: true, sameSite: 'Strict' }]);
  }

  /** Runs `use` in a new browser profile (empty cache), signed in as the planner or not, then deletes the profile. */
  async function inFreshBrowser(signedIn: boolean, use: (context: BrowserContext) => Promise<unknown>): Promise<void> {
    const profile = mkdtempSync(join(tmpdir(), 'descentry-bench-browser-'));
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: '/usr/bin/chromium',
      headless: true,
      args: CHROMIUM_ARGS,
    });
    try {
      if (signedIn) await addSessionCookie(context);
      await use(context);
    } finally {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    }
  }

  // The server shows each page once before the measured visits, in a browser profile of its own
  // that is then thrown away: its disk tile cache then holds the map tiles, as on any server in
  // use (tiles are rendered once per terrain catalogue version; the tiles benchmark measures that
  // rendering). "First visit" below is the browser's first visit, not the server's.
  for (const page of pages) await inFreshBrowser(page.signedIn, (context) => visit(context, `${instance.baseUrl}${page.path}`));

  const rows: string[] = [];
  const load = loadavg()[0]!;
  const signInPath = pages[0]!.path;
  for (const page of pages) {
    const first: Visit[] = [];
    const repeat: Visit[] = [];
    const afterSignIn: Visit[] = [];
    for (let run = 0; run < RUNS; run++) {
      await inFreshBrowser(page.signedIn, async (context) => {
        first.push(await visit(context, `${instance.baseUrl}${page.path}`));
        if (LIST_FILES && run === 0) printFiles(page.name, first[0]!.files);
        repeat.push(await visit(context, `${instance.baseUrl}${page.path}`));
      });
      // As a person comes to it: the sign-in page first (its files, fonts and Angular's own
      // scripts then in the browser's cache), then the page in a new tab once signed in.
      if (page.signedIn) {
        await inFreshBrowser(false, async (context) => {
          await visit(context, `${instance.baseUrl}${signInPath}`);
          await addSessionCookie(context);
          afterSignIn.push(await visit(context, `${instance.baseUrl}${page.path}`));
        });
      }
    }
    for (const [kind, visits] of [
      ['first', first],
      ['repeat', repeat],
      ['after sign-in', afterSignIn],
    ] as const) {
      if (visits.length > 0) rows.push(tableRow(page.name, kind, visits));
      if (visits.length > 0) console.log(rows.at(-1));
    }
  }
  console.log(
    `\n${RUNS} runs each; headless Chromium on loopback; this machine: ${cpus().length} cores, load average ${load.toFixed(1)} at the start, ${loadavg()[0]!.toFixed(1)} at the end`,
  );
  console.log(
    '| page | visit | transferred | requests | of which app files | API answers | map tiles | largest contentful paint |' +
      (TRACE_BUSY ? ' main thread busy before it |' : ''),
  );
  console.log('| --- | --- | ---: | ---: | ---: | ---: | ---: | ---: |' + (TRACE_BUSY ? ' ---: |' : ''));
  for (const row of rows) console.log(row);
} finally {
  await instance.stop();
}

/** Opens `url` in a new tab until the network is idle; what it transferred, asked for and painted. */
async function visit(context: BrowserContext, url: string): Promise<Visit> {
  const page = await context.newPage();
  const cdp = await context.newCDPSession(page);
  await cdp.send('Network.enable');
  await cdp.send('Network.setCacheDisabled', { cacheDisabled: false });
  const totals = { bytes: 0, appBytes: 0, apiBytes: 0, tileBytes: 0, requests: 0, fromCache: 0 };
  const urls = new Map<string, string>();
  const files = new Map<string, number>();
  const inFlight = new Set<string>();
  cdp.on('Network.loadingFailed', (event: { requestId: string }) => inFlight.delete(event.requestId));
  cdp.on('Network.requestWillBeSent', (event: { requestId: string; request: { url: string } }) => {
    inFlight.add(event.requestId);
    totals.requests += 1;
    urls.set(event.requestId, new URL(event.request.url).pathname);
  });
  cdp.on('Network.requestServedFromCache', () => (totals.fromCache += 1));
  cdp.on('Network.responseReceived', (event: { response: { fromDiskCache?: boolean } }) => {
    if (event.response.fromDiskCache) totals.fromCache += 1;
  });
  cdp.on('Network.loadingFinished', (event: { requestId: string; encodedDataLength: number }) => {
    inFlight.delete(event.requestId);
    const path = urls.get(event.requestId) ?? '';
    totals.bytes += event.encodedDataLength;
    files.set(path, (files.get(path) ?? 0) + event.encodedDataLength);
    if (path.startsWith('/api/tiles/')) totals.tileBytes += event.encodedDataLength;
    else if (path.startsWith('/api/')) totals.apiBytes += event.encodedDataLength;
    else totals.appBytes += event.encodedDataLength;
  });
  const trace = TRACE_BUSY ? await startTrace(cdp) : null;
  await page.goto(url, { waitUntil: 'networkidle' });
  // The map and the result's charts are deferred: they load right after the first paint. The
  // visit counts them, and what they fetch (tiles), so wait until they have replaced their
  // placeholders and the network has been quiet for half a second. (A deferred part below the
  // fold, such as the route editor's profile chart at this window size, loads only when scrolled
  // to, and is not counted.)
  await page
    .waitForFunction(() => !document.querySelector('.map-placeholder, .charts-placeholder'), undefined, { timeout: 15_000 })
    .catch(() => undefined);
  await quiet(() => inFlight.size, 500);
  const lcpMs = await page.evaluate(
    () =>
      new Promise<number>((done) => {
        new PerformanceObserver((list) => done(list.getEntries().at(-1)!.startTime)).observe({
          type: 'largest-contentful-paint',
          buffered: true,
        });
        setTimeout(() => done(Number.NaN), 3_000);
      }),
  );
  const busyMs = trace ? await trace.busyBeforeLcp() : Number.NaN;
  await page.close();
  return { ...totals, lcpMs, busyMs, files };
}

/** One row of the table: the ranges over `visits` of one page and kind of visit. */
function tableRow(pageName: string, kind: string, visits: Visit[]): string {
  const kB = (pick: (visit: Visit) => number) =>
    range(
      visits.map((visit) => pick(visit) / 1024),
      1,
    );
  const count = (pick: (visit: Visit) => number) => range(visits.map(pick), 0);
  return (
    `| ${pageName} | ${kind} | ${kB((v) => v.bytes)} kB | ${count((v) => v.requests)} (${count((v) => v.fromCache)} from cache) | ` +
    `${kB((v) => v.appBytes)} kB | ${kB((v) => v.apiBytes)} kB | ${kB((v) => v.tileBytes)} kB | ${count((v) => v.lcpMs)} ms |` +
    (TRACE_BUSY ? ` ${count((v) => v.busyMs)} ms |` : '')
  );
}

interface TraceEvent {
  name: string;
  pid: number;
  tid: number;
  ts: number;
  dur?: number;
}

/**
 * Traces the tab from here on. `busyBeforeLcp` ends the trace and sums the tasks the page's main
 * thread ran from the navigation's start to the last largest contentful paint candidate: the
 * part of the LCP that no faster network or server could take away.
 */
async function startTrace(cdp: CDPSession): Promise<{ busyBeforeLcp: () => Promise<number> }> {
  const events: TraceEvent[] = [];
  cdp.on('Tracing.dataCollected', (event) => {
    events.push(...(event.value as unknown as TraceEvent[]));
  });
  await cdp.send('Tracing.start', {
    categories: 'devtools.timeline,disabled-by-default-devtools.timeline,blink.user_timing,loading',
    transferMode: 'ReportEvents',
  });
  return {
    async busyBeforeLcp() {
      const complete = new Promise((resolve) => cdp.once('Tracing.tracingComplete', resolve));
      await cdp.send('Tracing.end');
      await complete;
      const lcp = events.filter((event) => event.name === 'largestContentfulPaint::Candidate').at(-1);
      // The navigation of that paint (the last one started before it) and the page's main thread:
      // the one that ran the most tasks in between (the tab may have changed renderer process).
      const navigation = events.filter((event) => event.name === 'navigationStart' && lcp !== undefined && event.ts < lcp.ts).at(-1);
      if (!navigation || !lcp) return Number.NaN;
      const tasks = events.filter((event) => event.name === 'RunTask' && event.ts + (event.dur ?? 0) > navigation.ts && event.ts < lcp.ts);
      const perThread = new Map<string, number>();
      for (const task of tasks) perThread.set(`${task.pid}:${task.tid}`, (perThread.get(`${task.pid}:${task.tid}`) ?? 0) + (task.dur ?? 0));
      const main = [...perThread].sort((a, b) => b[1] - a[1])[0]?.[0];
      const busyMicros = tasks
        .filter((event) => `${event.pid}:${event.tid}` === main)
        .reduce((sum, event) => sum + Math.min(event.ts + (event.dur ?? 0), lcp.ts) - Math.max(event.ts, navigation.ts), 0);
      return busyMicros / 1000;
    },
  };
}

/** Resolves once nothing has been in flight for `quietMs` (at most 15 s). */
async function quiet(inFlight: () => number, quietMs: number): Promise<void> {
  const end = Date.now() + 15_000;
  let quietSince = Date.now();
  while (Date.now() < end) {
    if (inFlight() > 0) quietSince = Date.now();
    else if (Date.now() - quietSince >= quietMs) return;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

function printFiles(pageName: string, files: Map<string, number>): void {
  const sorted = [...files].sort((a, b) => b[1] - a[1]);
  const total = sorted.reduce((sum, [, bytes]) => sum + bytes, 0);
  console.log(`\n${pageName}, first visit: ${(total / 1024).toFixed(1)} kB in ${sorted.length} files`);
  for (const [path, bytes] of sorted) console.log(`  ${(bytes / 1024).toFixed(1).padStart(7)} kB  ${path}`);
}

/** The session cookie (`name=value`) of a Cookie header that may carry others too. */
function sessionCookie(header: string): string {
  const session = header.split('; ').find((c) => c.startsWith('descentry_session='));
  if (!session) throw new Error('no session cookie');
  return session;
}

async function getJson(baseUrl: string, path: string, cookie: string): Promise<unknown> {
  const response = await fetch(`${baseUrl}${path}`, { headers: { Cookie: cookie } });
  if (!response.ok) throw new Error(`${path}: ${response.status}`);
  return response.json();
}

function range(values: number[], digits: number): string {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length === 0) return '–';
  const low = Math.min(...finite);
  const high = Math.max(...finite);
  return low.toFixed(digits) === high.toFixed(digits) ? low.toFixed(digits) : `${low.toFixed(digits)}–${high.toFixed(digits)}`;
}
