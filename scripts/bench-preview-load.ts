/**
 * How the API holds up while analyses run: `node --import tsx scripts/bench-preview-load.ts`
 * (needs `npm run build:api`; starts a scratch instance of this checkout, see scratch-instance.ts).
 *
 * 1. Idle: /api/health latency with nothing else running.
 * 2. Twenty people each keep one 20 km preview at 1 m spacing (20 001 points) running for 20 s
 *    (autocannon, one connection per person); /api/health is asked every 100 ms meanwhile, from
 *    a separate process, and its latency reported (p50, p95, max).
 * 3. One person fires twenty concurrent previews for 10 s: how many are answered and how many
 *    refused (429, the per-person limit; 503, a full analysis queue).
 *
 * Run it on an older checkout to compare (the README gives both).
 */
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import autocannon from 'autocannon';
import { addPeople, signIn, startScratchInstance, straightDescentPreview } from './scratch-instance';

const LOAD_S = 20;
const ROUTE_KM = 20;

if (process.argv[2] === '--probe') {
  await probe(process.argv[3]!, Number(process.argv[4]));
} else {
  await main();
}

async function main(): Promise<void> {
  const instance = await startScratchInstance('descentry_bench_load');
  try {
    const people = await addPeople(instance, 'planner', 21);
    const cookies: string[] = [];
    for (const email of people) cookies.push(await signIn(instance, email));
    const body = JSON.stringify(straightDescentPreview(ROUTE_KM));

    const idle = await healthDuring(instance.baseUrl, 5, async () => undefined);
    const crowd = await healthDuring(instance.baseUrl, LOAD_S, async () => {
      const runs = cookies.slice(0, 20).map((cookie) => cannon(instance.baseUrl, cookie, body, 1, LOAD_S));
      return Promise.all(runs);
    });
    const previews = (crowd.work as autocannon.Result[]).reduce(
      (sum, result) => ({ ok: sum.ok + result['2xx'], other: sum.other + result.non2xx + result.errors + result.timeouts }),
      { ok: 0, other: 0 },
    );
    const alone = await cannon(instance.baseUrl, cookies[20]!, body, 20, 10);
    const statuses = alone.statusCodeStats as unknown as Record<string, { count: number }>;

    console.log(
      `\n${ROUTE_KM} km preview at 1 m spacing; ${LOAD_S} s of load; this machine: ${(await import('node:os')).cpus().length} cores`,
    );
    console.log('| load | /api/health p50 | p95 | max | previews answered | previews refused or failed |');
    console.log('| --- | ---: | ---: | ---: | ---: | ---: |');
    console.log(`| none | ${ms(idle.p50)} | ${ms(idle.p95)} | ${ms(idle.max)} | – | – |`);
    console.log(
      `| 20 people × 1 preview at a time | ${ms(crowd.p50)} | ${ms(crowd.p95)} | ${ms(crowd.max)} | ${previews.ok} | ${previews.other} |`,
    );
    console.log(
      `\nOne person, 20 concurrent previews for 10 s: ${alone['2xx']} answered, ` +
        `${statuses['429']?.count ?? 0} refused with 429, ${statuses['503']?.count ?? 0} with 503, ` +
        `${alone.non2xx - (statuses['429']?.count ?? 0) - (statuses['503']?.count ?? 0)} other errors, ${alone.errors + alone.timeouts} failed connections.`,
    );
  } finally {
    await instance.stop();
  }
}

/** autocannon posting the preview with one person's cookie. */
function cannon(baseUrl: string, cookie: string, body: string, connections: number, seconds: number): Promise<autocannon.Result> {
  return new Promise((resolve, reject) => {
    autocannon(
      {
        url: `${baseUrl}/api/analysis/preview`,
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Cookie: cookie },
        body,
        connections,
        duration: seconds,
        timeout: 120,
      },
      (error, result) => (error ? reject(error) : resolve(result)),
    );
  });
}

/** Runs `work` while a separate process asks /api/health every 100 ms; returns the latencies. */
async function healthDuring(baseUrl: string, seconds: number, work: () => Promise<unknown>) {
  const child = spawn(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--probe', baseUrl, String(seconds)], {
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  let output = '';
  child.stdout.on('data', (chunk) => (output += chunk));
  const done = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const result = await work();
  await done;
  const latencies = (JSON.parse(output) as number[]).sort((a, b) => a - b);
  const at = (share: number) => latencies[Math.min(latencies.length - 1, Math.floor(share * latencies.length))]!;
  return { p50: at(0.5), p95: at(0.95), max: latencies.at(-1)!, work: result };
}

async function probe(baseUrl: string, seconds: number): Promise<void> {
  const latencies: number[] = [];
  const end = Date.now() + seconds * 1000;
  while (Date.now() < end) {
    const started = performance.now();
    await fetch(`${baseUrl}/api/health`).then((response) => response.arrayBuffer());
    latencies.push(performance.now() - started);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  process.stdout.write(JSON.stringify(latencies));
}

function ms(value: number): string {
  return `${value.toFixed(value < 10 ? 1 : 0)} ms`;
}
