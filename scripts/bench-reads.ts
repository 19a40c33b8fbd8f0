/**
 * The reads the route editor and the scenario result make on every visit, timed on the server:
 * `node --import tsx scripts/bench-reads.ts [requests]` (needs `npm run build:api`; starts a
 * scratch instance of this checkout, loads the invented demo into it, signs in as the demo
 * planner).
 *
 * 1. Over HTTP (loopback, one request at a time, `requests` of each, default 20, after 3 unmeasured
 *    ones): the scenario result as the result page asks for it (thinned, the drawn series) and
 *    the scenario, first as a new visit (200, brotli accepted) and then as a repeat visit (the
 *    browser's If-None-Match, 304); the route editor's elevation profile of the saved current
 *    version as the GET the editor asks for (200 and 304) and as the POST it sends while editing.
 *    Median, fastest and slowest time to the whole answer, and its size on the wire.
 * 2. Where the time of a built result goes, in this process against the same database: reading
 *    the row, checking the stored result against the contract, thinning, JSON, SHA-256 of the
 *    JSON and brotli at the quality the API's compression uses; median of `requests` each.
 *
 * Loopback and one client: the figures are the server's own costs, not a network's. Other work
 * on the machine shows in them: the script prints the load average.
 */
import { createHash } from 'node:crypto';
import { request as httpRequest } from 'node:http';
import { loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { brotliCompressSync, constants as zlib } from 'node:zlib';
import { viewProfile } from '../shared/engine/profile-view';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../api/demo/demo-people';
import { createDatabase } from '../api/db/client';
import * as scenarios from '../api/scenarios/scenarios-repository';
import { RESULT_SCREEN_SERIES, RESULT_SCREEN_STEP_M, scenarioResultScreenPath } from '../web/app/scenarios/scenario-paths';
import { loadDemo, signIn, startScratchInstance } from './scratch-instance';

const REQUESTS = Number(process.argv[2] ?? 20);
const WARM_UP = 3;

interface Timed {
  ms: number[];
  status: number;
  bytes: number;
}

const instance = await startScratchInstance('descentry_bench_reads');
try {
  console.log('loading the demo into the scratch instance…');
  await loadDemo(instance);
  const planner = DEMO_PEOPLE.find((person) => person.role === 'planner')!;
  const cookie = await signIn(instance, planner.email, DEMO_PASSWORD);
  const routes = (await getJson('/api/routes')) as { items: { id: string; currentVersion?: number; version?: number }[] };
  const list = (await getJson('/api/scenarios')) as { items: { id: string; status: string }[] };
  const scenario = list.items.find((item) => item.status === 'done');
  const route = routes.items[0];
  if (!route || !scenario) throw new Error('the demo has no route or no computed scenario');
  const saved = (await getJson(`/api/routes/${route.id}`)) as { version: number; geometry: unknown };

  const resultPath = scenarioResultScreenPath(scenario.id);
  const profilePath = `/api/routes/${route.id}/versions/${saved.version}/profile`;
  const load = loadavg().map((value) => value.toFixed(1));
  console.log(`\n${new Date().toISOString()}, load average ${load.join(' ')}, ${REQUESTS} requests each (median, fastest–slowest)\n`);
  console.log('| read | answer | median | range | on the wire |');
  console.log('| --- | --- | ---: | ---: | ---: |');
  for (const [name, path] of [
    ['scenario result (result page)', resultPath],
    ['scenario', `/api/scenarios/${scenario.id}`],
    ['saved version’s profile (GET)', profilePath],
  ] as const) {
    const fresh = await timed(() => request(path));
    row(name, fresh);
    const etag = (await request(path)).etag;
    if (fresh.status === 200 && etag) row(name, await timed(() => request(path, { 'If-None-Match': etag })));
  }
  row(
    'edited geometry’s profile (POST)',
    await timed(() => request('/api/routes/profile', {}, JSON.stringify({ geometry: saved.geometry }))),
  );

  console.log(`\nWhere a built scenario result's time goes (this process, same database; median of ${REQUESTS}):\n`);
  const { db, close } = createDatabase(instance.databaseUrl, { max: 1 });
  try {
    const steps: Record<string, number[]> = { 'read the row': [], 'check against the contract': [], thin: [], JSON: [] };
    Object.assign(steps, { 'SHA-256 of the JSON': [], 'brotli (quality 1, as the API compresses)': [] });
    let sizes = { json: 0, brotli: 0 };
    for (let i = 0; i < WARM_UP + REQUESTS; i++) {
      const keep = i >= WARM_UP;
      const at = [performance.now()];
      const row = await scenarios.findScenarioRow(db, scenario.id);
      at.push(performance.now());
      const stored = scenarios.readScenarioResult(row!)!;
      at.push(performance.now());
      const directions = stored.directions.map((direction) => ({
        ...direction,
        profile: viewProfile(direction.profile, { profileStepM: RESULT_SCREEN_STEP_M, series: [...RESULT_SCREEN_SERIES] }),
      }));
      at.push(performance.now());
      const json = JSON.stringify({ ...stored, inputs: row!.inputs, directions });
      at.push(performance.now());
      createHash('sha256').update(json).digest('base64url');
      at.push(performance.now());
      const brotli = brotliCompressSync(json, { params: { [zlib.BROTLI_PARAM_QUALITY]: 1 } });
      at.push(performance.now());
      sizes = { json: json.length, brotli: brotli.length };
      if (keep) Object.values(steps).forEach((list, step) => list.push(at[step + 1]! - at[step]!));
    }
    console.log('| step | median |');
    console.log('| --- | ---: |');
    for (const [step, list] of Object.entries(steps)) console.log(`| ${step} | ${median(list).toFixed(1)} ms |`);
    console.log(`\n(the answer: ${(sizes.json / 1000).toFixed(0)} kB of JSON, ${(sizes.brotli / 1000).toFixed(1)} kB in brotli)`);
  } finally {
    await close();
  }

  async function getJson(path: string): Promise<unknown> {
    const response = await fetch(`${instance.baseUrl}${path}`, { headers: { Cookie: cookie } });
    if (!response.ok) throw new Error(`${path}: ${response.status}`);
    return response.json();
  }

  /** One request; resolves once the whole body has arrived. `bytes`: the body as it came over the wire (compressed). */
  function request(path: string, headers: Record<string, string> = {}, body?: string) {
    return new Promise<{ status: number; etag: string | null; bytes: number }>((resolve, reject) => {
      const sent = httpRequest(
        `${instance.baseUrl}${path}`,
        {
          method: body === undefined ? 'GET' : 'POST',
          headers: { Cookie: cookie, 'Accept-Encoding': 'br, gzip', ...(body ? { 'Content-Type': 'application/json' } : {}), ...headers },
        },
        (response) => {
          let bytes = 0;
          response.on('data', (chunk: Buffer) => (bytes += chunk.length));
          response.on('end', () => resolve({ status: response.statusCode ?? 0, etag: (response.headers.etag as string) ?? null, bytes }));
          response.on('error', reject);
        },
      );
      sent.on('error', reject);
      sent.end(body);
    });
  }
} finally {
  await instance.stop();
}

async function timed(send: () => Promise<{ status: number; bytes: number }>): Promise<Timed> {
  const ms: number[] = [];
  let last = { status: 0, bytes: 0 };
  for (let i = 0; i < WARM_UP + REQUESTS; i++) {
    const start = performance.now();
    last = await send();
    if (i >= WARM_UP) ms.push(performance.now() - start);
  }
  return { ms, status: last.status, bytes: last.bytes };
}

function row(name: string, timing: Timed): void {
  const sorted = [...timing.ms].sort((a, b) => a - b);
  const wire = timing.status === 304 ? 'no body' : `${(timing.bytes / 1000).toFixed(1)} kB`;
  console.log(
    `| ${name} | ${timing.status} | ${median(timing.ms).toFixed(1)} ms | ${sorted[0]!.toFixed(1)}–${sorted.at(-1)!.toFixed(1)} ms | ${wire} |`,
  );
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}
