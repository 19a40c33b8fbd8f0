/**
 * API throughput on the invented demo: `node --import tsx scripts/bench-api-load.ts [runs] [seconds]`
 * (needs `npm run build:api`; starts a scratch instance of this checkout, see scratch-instance.ts,
 * and loads the demo into it, about a minute).
 *
 * With autocannon (one process, keep-alive, the demo planner's session cookie, gzip accepted as a
 * browser would): the list endpoints (routes, scenarios, vehicle profiles) at 20 and 50
 * connections, a 20 km preview at 20 connections (20 people, one connection each, since one
 * person may have only two analyses running; analyses past the threads and their queue are refused
 * with 503 at once, counted apart from errors), once with the full profile and once with the
 * profile a chart draws (`profileStepM=25&series=…`), a terrain tile and a base-map tile (both
 * already in the server's caches) at 50 connections. Each load runs `runs` times (default 3) for
 * `seconds` (default 10); the table gives the range over the runs. The server's resident memory
 * is read before and after, and the machine's load average is printed, because the machine is
 * shared and every figure moves with it; the server's CPU time per answer (from /proc) is printed
 * too, as it moves much less with the machine's other work than requests per second do.
 *
 * BENCH_LOADS=routes,vehicles runs only the loads whose name holds one of those words;
 * BENCH_CPU_PROF=<folder> has the server write a V8 CPU profile there when it stops (open it in
 * Chromium's DevTools, Performance panel), to see where a request's time goes.
 */
import { cpus, loadavg } from 'node:os';
import { readFileSync } from 'node:fs';
import autocannon from 'autocannon';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../api/demo/demo-people';
import { addPeople, loadDemo, signIn, startScratchInstance, straightDescentPreview, type ScratchInstance } from './scratch-instance';

const RUNS = Number(process.argv[2] ?? 3);
const SECONDS = Number(process.argv[3] ?? 10);
const ROUTE_KM = 20;
const CHART_VIEW = 'profileStepM=25&series=elevationM,speedMps,brakeTempC,gsrsBrakeTempC,soc';

interface Load {
  name: string;
  path: string;
  connections: number;
  /** One cookie per connection (previews) or one for all. */
  perPerson?: boolean;
  body?: string;
}

const ONLY = (process.env['BENCH_LOADS'] ?? '')
  .split(',')
  .map((word) => word.trim())
  .filter(Boolean);
const CPU_PROF = process.env['BENCH_CPU_PROF'];

if (CPU_PROF) process.env['SCRATCH_NODE_ARGS'] = `--cpu-prof --cpu-prof-dir=${CPU_PROF}`;

const instance = await startScratchInstance('descentry_bench_api');
try {
  console.log('loading the demo into the scratch instance…');
  await loadDemo(instance);

  const planner = DEMO_PEOPLE.find((person) => person.role === 'planner')!;
  const cookie = await signInAs(instance, planner.email, DEMO_PASSWORD);
  const previewers: string[] = [];
  for (const email of await addPeople(instance, 'planner', 20)) previewers.push(await signIn(instance, email));
  const body = JSON.stringify(straightDescentPreview(ROUTE_KM));
  const { terrainTile, baseTile } = await demoTiles(instance, cookie);

  const allLoads: Load[] = [
    ...[20, 50].flatMap((connections) =>
      ['/api/routes', '/api/scenarios', '/api/vehicles'].map((path) => ({ name: `GET ${path}`, path, connections })),
    ),
    {
      name: `POST /api/analysis/preview (${ROUTE_KM} km, full profile)`,
      path: '/api/analysis/preview',
      connections: 20,
      perPerson: true,
      body,
    },
    {
      name: `POST /api/analysis/preview (${ROUTE_KM} km, chart view)`,
      path: `/api/analysis/preview?${CHART_VIEW}`,
      connections: 20,
      perPerson: true,
      body,
    },
    { name: 'GET terrain tile (cached)', path: terrainTile, connections: 50 },
    { name: 'GET base-map tile (cached)', path: baseTile, connections: 50 },
  ];

  const loads = ONLY.length ? allLoads.filter((load) => ONLY.some((word) => load.name.includes(word))) : allLoads;
  const rssBefore = rssMb(instance);
  const loadBefore = loadavg();
  console.log(
    `server RSS before: ${rssBefore.toFixed(0)} MB; load average ${loadBefore.map((v) => v.toFixed(2)).join(' ')} on ${cpus().length} cores`,
  );
  const rows: string[] = [];
  for (const load of loads) {
    // One answer while the server is idle, for its size on the wire.
    const bytes = await answerBytes(instance.baseUrl, load, load.perPerson ? previewers[0]! : cookie);
    const results: autocannon.Result[] = [];
    const cpuPerRequest: number[] = [];
    for (let run = 0; run < RUNS; run++) {
      const cpuBefore = cpuMs(instance);
      const result = load.perPerson ? await crowd(instance.baseUrl, load, previewers) : await cannon(instance.baseUrl, load, cookie);
      results.push(result);
      cpuPerRequest.push(((cpuMs(instance) - cpuBefore) * 1_000) / Math.max(1, result['2xx']));
    }
    const refused = results.reduce((sum, r) => sum + statusCount(r, 429) + statusCount(r, 503), 0);
    const failed = results.reduce((sum, r) => sum + r.errors + r.timeouts + r.non2xx, 0) - refused;
    rows.push(
      `| ${load.name} | ${load.connections} | ${range(
        results.map((r) => r['2xx'] / SECONDS),
        0,
      )} | ` +
        `${range(
          results.map((r) => r.latency.p50),
          0,
        )} ms | ${range(
          results.map((r) => r.latency.p99),
          0,
        )} ms | ` +
        `${failed} | ${refused} | ${range(cpuPerRequest, 0)} µs | ${bytes} |`,
    );
    console.log(rows.at(-1));
  }
  const rssAfter = rssMb(instance);
  const loadAfter = loadavg();

  console.log(
    `\n${RUNS} runs of ${SECONDS} s each; this machine: ${cpus().length} cores; ` +
      `load average ${loadBefore[0]!.toFixed(1)} before, ${loadAfter[0]!.toFixed(1)} after`,
  );
  console.log(
    '| load | connections | answered/s (2xx) | p50 | p99 | errors (all runs) | refused 429/503 (all runs) | server CPU per answer | answer on the wire |',
  );
  console.log('| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |');
  for (const row of rows) console.log(row);
  console.log(`\nServer RSS: ${rssBefore.toFixed(0)} MB before, ${rssAfter.toFixed(0)} MB after.`);
} finally {
  await instance.stop();
}

function cannon(baseUrl: string, load: Load, cookie: string, connections = load.connections): Promise<autocannon.Result> {
  return new Promise((resolve, reject) => {
    autocannon(
      {
        url: `${baseUrl}${load.path}`,
        method: load.body ? 'POST' : 'GET',
        headers: {
          Cookie: cookie,
          'Accept-Encoding': 'gzip',
          ...(load.body ? { 'Content-Type': 'application/json' } : {}),
        },
        ...(load.body ? { body: load.body } : {}),
        connections,
        duration: SECONDS,
        timeout: 60,
      },
      (error, result) => (error ? reject(error) : resolve(result)),
    );
  });
}

/** One connection per person, all at once; merged into one result (sums and the worst latencies). */
async function crowd(baseUrl: string, load: Load, cookies: string[]): Promise<autocannon.Result> {
  const results = await Promise.all(cookies.slice(0, load.connections).map((cookie) => cannon(baseUrl, load, cookie, 1)));
  const merged = structuredClone(results[0]!);
  merged.requests.average = results.reduce((sum, r) => sum + r.requests.average, 0);
  const latencies = results.map((r) => r.latency);
  merged.latency.p50 = median(latencies.map((l) => l.p50));
  merged.latency.p99 = Math.max(...latencies.map((l) => l.p99));
  merged.errors = results.reduce((sum, r) => sum + r.errors, 0);
  merged.timeouts = results.reduce((sum, r) => sum + r.timeouts, 0);
  merged.non2xx = results.reduce((sum, r) => sum + r.non2xx, 0);
  merged['2xx'] = results.reduce((sum, r) => sum + r['2xx'], 0);
  const codes = merged.statusCodeStats as unknown as Record<string, { count: number }>;
  for (const key of Object.keys(codes)) delete codes[key];
  for (const result of results) {
    for (const [code, { count }] of Object.entries(result.statusCodeStats as unknown as Record<string, { count: number }>)) {
      codes[code] = { count: (codes[code]?.count ?? 0) + count };
    }
  }
  return merged;
}

/** The size of one answer as sent (gzip accepted), and its size unpacked. */
async function answerBytes(baseUrl: string, load: Load, cookie: string): Promise<string> {
  const { request } = await import('node:http');
  const url = new URL(`${baseUrl}${load.path}`);
  return new Promise((resolve, reject) => {
    const req = request(
      url,
      {
        method: load.body ? 'POST' : 'GET',
        headers: { Cookie: cookie, 'Accept-Encoding': 'gzip', ...(load.body ? { 'Content-Type': 'application/json' } : {}) },
      },
      (res) => {
        let size = 0;
        res.on('data', (chunk: Buffer) => (size += chunk.length));
        res.on('end', () => resolve(`${kb(size)}${res.headers['content-encoding'] ? ` (${res.headers['content-encoding']})` : ''}`));
      },
    );
    req.on('error', reject);
    req.end(load.body);
  });
}

async function signInAs(scratch: ScratchInstance, email: string, password: string): Promise<string> {
  const response = await fetch(`${scratch.baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (!response.ok) throw new Error(`sign-in as ${email}: ${response.status}`);
  return response.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

/** A z13 tile at the middle of the demo terrain, asked once so both tiles are in the caches. */
async function demoTiles(scratch: ScratchInstance, cookie: string) {
  const catalogue = (await (await fetch(`${scratch.baseUrl}/api/terrain`, { headers: { Cookie: cookie } })).json()) as {
    items: { footprint: { coordinates: number[][][] } | null }[];
  };
  const ring = catalogue.items.find((item) => item.footprint)?.footprint?.coordinates[0];
  if (!ring) throw new Error('the demo has no ingested terrain');
  const lon = ring.reduce((sum, p) => sum + p[0]!, 0) / ring.length;
  const lat = ring.reduce((sum, p) => sum + p[1]!, 0) / ring.length;
  const zoom = 13;
  const x = Math.floor(((lon + 180) / 360) * 2 ** zoom);
  const y = Math.floor(((1 - Math.log(Math.tan((lat * Math.PI) / 180) + 1 / Math.cos((lat * Math.PI) / 180)) / Math.PI) / 2) * 2 ** zoom);
  const terrainTile = `/api/tiles/terrain/${zoom}/${x}/${y}.png`;
  const baseTile = `/api/tiles/base/${zoom}/${x}/${y}.pbf`;
  for (const path of [terrainTile, baseTile]) {
    const response = await fetch(`${scratch.baseUrl}${path}`, { headers: { Cookie: cookie } });
    const bytes = (await response.arrayBuffer()).byteLength;
    if (!response.ok || bytes === 0) throw new Error(`${path}: ${response.status}, ${bytes} bytes`);
  }
  return { terrainTile, baseTile };
}

/**
 * CPU time the server process (all its threads) has used so far, ms. Divided by the answers of a
 * run it gives the cost of one answer, which moves far less than requests per second when other
 * processes share the cores.
 */
function cpuMs(scratch: ScratchInstance): number {
  const fields = readFileSync(`/proc/${scratch.server.pid}/stat`, 'utf8')
    .replace(/^.*\) /, '')
    .split(' ');
  // utime and stime are fields 14 and 15 of stat, in clock ticks (100 per second on Linux).
  return ((Number(fields[11]) + Number(fields[12])) * 1_000) / 100;
}

function rssMb(scratch: ScratchInstance): number {
  const status = readFileSync(`/proc/${scratch.server.pid}/status`, 'utf8');
  return Number(/VmRSS:\s+(\d+)/.exec(status)![1]) / 1024;
}

function statusCount(result: autocannon.Result, status: number): number {
  return (result.statusCodeStats as unknown as Record<string, { count: number } | undefined>)[String(status)]?.count ?? 0;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

function range(values: number[], digits: number): string {
  const low = Math.min(...values);
  const high = Math.max(...values);
  return low === high ? low.toFixed(digits) : `${low.toFixed(digits)}–${high.toFixed(digits)}`;
}

function kb(bytes: number): string {
  return bytes < 1024 ? `${bytes} B` : `${(bytes / 1024).toFixed(bytes < 10_240 ? 1 : 0)} kB`;
}
