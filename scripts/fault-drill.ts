/**
 * Fault drills against a scratch instance: `node --import tsx scripts/fault-drill.ts [drill…]`
 * (needs `npm run build:api`; drills: database, upload, ingestion, network-run, mail; all by
 * default). Each drill breaks something the way a bad day would, then checks what held:
 *
 * - database:    PostgreSQL stopped for 8 s and started again while five people keep reading lists;
 *                every answer must be 200 or 503 with Retry-After (never 500), none may hang
 *                past the connect timeout, and reads must succeed again soon after;
 * - upload:      the server killed (SIGKILL) in the middle of a 300 MB terrain upload; after a
 *                restart no partial file and no catalogue row may be left;
 * - ingestion:   the server killed while it ingests a 400 MB model; after a restart the model
 *                must become ready and the killed job must not linger as active in the queue;
 * - network-run: the server killed in the middle of a network-wide run; after a restart every
 *                item must finish, none left queued or running;
 * - mail:        the SMTP relay greets and then goes silent; the worker must give up on it well
 *                inside its claim, and once the relay works the message must arrive exactly once.
 *
 * The drills restart this checkout's private PostgreSQL cluster and use their own database
 * (descentry_drill) and data folder. Prints one line per drill and a table of what held.
 */
import { createServer, type Socket } from 'node:net';
import { existsSync, mkdirSync, readdirSync, writeFileSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { join } from 'node:path';
import postgres from 'postgres';
import { SMTPServer } from 'smtp-server';
import { writeFloat32GeoTiff } from '../api/terrain/raster/geotiff-writer';
import { addPeople, freePort, restartDatabaseCluster, signIn, startScratchInstance, type ScratchInstance } from './scratch-instance';

interface Outcome {
  drill: string;
  held: boolean;
  what: string;
}

const DRILLS: Record<string, (instance: ScratchInstance, cookies: Cookies) => Promise<Outcome>> = {
  database: databaseRestart,
  upload: killMidUpload,
  ingestion: killMidIngestion,
  'network-run': killMidNetworkRun,
  mail: silentRelay,
};
type Cookies = Record<'planner' | 'analyst' | 'admin' | 'reader', string>;

// The drills

/** How long PostgreSQL stays down in the database drill, ms. */
const DATABASE_DOWN_MS = 8_000;

async function databaseRestart(instance: ScratchInstance, cookies: Cookies): Promise<Outcome> {
  const statuses = new Map<number | string, number>();
  let missingRetryAfter = 0;
  let slowestMs = 0;
  let stop = false;
  let backAt = 0;
  let firstOkAfterBack = 0;
  const reader = async () => {
    while (!stop) {
      const started = Date.now();
      let status: number | string;
      try {
        const response = await fetch(`${instance.baseUrl}/api/routes`, {
          headers: { Cookie: cookies.reader },
          signal: AbortSignal.timeout(60_000),
        });
        status = response.status;
        if (status === 503 && !response.headers.get('retry-after')) missingRetryAfter++;
        await response.arrayBuffer();
        if (status === 200 && backAt && !firstOkAfterBack) firstOkAfterBack = Date.now();
      } catch (error) {
        status = error instanceof Error ? error.name : 'error';
      }
      slowestMs = Math.max(slowestMs, Date.now() - started);
      statuses.set(status, (statuses.get(status) ?? 0) + 1);
      await sleep(50);
    }
  };
  const readers = Array.from({ length: 5 }, reader);
  await sleep(2_000);
  await restartDatabaseCluster(DATABASE_DOWN_MS);
  backAt = Date.now();
  await sleep(8_000);
  stop = true;
  await Promise.all(readers);
  const failures = [...statuses.keys()].filter((status) => status !== 200 && status !== 503);
  const recoveryS = firstOkAfterBack ? (firstOkAfterBack - backAt) / 1000 : Number.POSITIVE_INFINITY;
  const counts = [...statuses.entries()].map(([status, n]) => `${n}× ${status}`).join(', ');
  return {
    drill: 'database restart under read load',
    held: failures.length === 0 && missingRetryAfter === 0 && slowestMs < 10_000 && recoveryS < 10,
    what:
      `PostgreSQL down ${DATABASE_DOWN_MS / 1000} s: answers ${counts}; slowest ${(slowestMs / 1000).toFixed(1)} s; reads back ${recoveryS.toFixed(1)} s after PostgreSQL was up` +
      (missingRetryAfter ? `; ${missingRetryAfter} × 503 without Retry-After` : ''),
  };
}

async function killMidUpload(instance: ScratchInstance, cookies: Cookies): Promise<Outcome> {
  const boundary = 'drill-boundary';
  const request = httpRequest(`${instance.baseUrl}/api/terrain`, {
    method: 'POST',
    headers: { Cookie: cookies.analyst, 'Content-Type': `multipart/form-data; boundary=${boundary}`, 'Transfer-Encoding': 'chunked' },
  });
  request.on('error', () => undefined);
  request.write(`--${boundary}\r\nContent-Disposition: form-data; name="name"\r\n\r\nHalf an upload\r\n`);
  request.write(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.tif"\r\nContent-Type: image/tiff\r\n\r\n`);
  const chunk = Buffer.alloc(1024 * 1024, 7);
  let sent = 0;
  while (sent < 60 * 1024 * 1024) {
    if (!request.write(chunk)) await new Promise((resolve) => request.once('drain', resolve));
    sent += chunk.length;
  }
  const partialBefore = readdirSafe(join(instance.dataDir, 'uploads')).length;
  await instance.kill('SIGKILL');
  request.destroy();
  await instance.restart();
  const leftovers = readdirSafe(join(instance.dataDir, 'uploads'));
  const rows = await count(instance, `select count(*)::int as n from terrain_models`);
  return {
    drill: 'kill -9 mid-upload',
    held: partialBefore > 0 && leftovers.length === 0 && rows === 0,
    what: `killed after ${sent / 1024 / 1024} MB of a 300 MB upload (${partialBefore} partial file on disk); after the restart ${leftovers.length} partial file(s), ${rows} catalogue row(s)`,
  };
}

async function killMidIngestion(instance: ScratchInstance, cookies: Cookies): Promise<Outcome> {
  const file = join(process.cwd(), '.var', 'drill', 'drill-terrain-10000.tif');
  if (!existsSync(file)) {
    mkdirSync(join(process.cwd(), '.var', 'drill'), { recursive: true });
    const size = 10_000;
    const values = new Float32Array(size * size);
    for (let row = 0; row < size; row++)
      for (let col = 0; col < size; col++)
        values[row * size + col] = 1200 + 300 * Math.sin(col / 700) * Math.cos(row / 900) + (row % 13) * 0.1;
    writeFileSync(
      file,
      writeFloat32GeoTiff({
        widthPx: size,
        heightPx: size,
        values,
        epsg: 32632,
        originX: 600_000,
        originY: 5_200_000,
        pixelSizeM: 5,
        nodata: -9999,
      }),
    );
  }
  const form = new FormData();
  form.append('name', 'Drill valley, 5 m');
  form.append('file', new Blob([await (await import('node:fs/promises')).readFile(file)]), 'drill-valley.tif');
  const accepted = await fetch(`${instance.baseUrl}/api/terrain`, { method: 'POST', headers: { Cookie: cookies.analyst }, body: form });
  if (accepted.status !== 201) throw new Error(`upload answered ${accepted.status}: ${await accepted.text()}`);
  const { id } = (await accepted.json()) as { id: string };
  const sql = postgres(instance.databaseUrl, { max: 1, onnotice: () => undefined });
  try {
    // The queue's job for this model once a worker has taken it (the queue's own table, so the
    // drill reads the same on older checkouts).
    let jobId: string | null = null;
    for (let i = 0; i < 600 && !jobId; i++) {
      const [row] = await sql<
        { id: string }[]
      >`select id from pgboss.job where name = 'terrain-ingest' and state = 'active' and data->>'terrainId' = ${id}`;
      if (row) jobId = row.id;
      else await sleep(100);
    }
    if (!jobId) throw new Error('ingestion never started');
    await sleep(1_500);
    await instance.kill('SIGKILL');
    const killedAt = Date.now();
    await instance.restart();
    let status = 'processing';
    while (status === 'processing' && Date.now() - killedAt < 300_000) {
      await sleep(2_000);
      [{ status } = { status: 'missing' }] = await sql<{ status: string }[]>`select status from terrain_models where id = ${id}`;
    }
    const readyAfterS = (Date.now() - killedAt) / 1000;
    const [killedJob] = await sql<
      { state: string }[]
    >`select state from pgboss.job where id = ${jobId}::uuid union all select state from pgboss.archive where id = ${jobId}::uuid`;
    const [active] = await sql<
      { n: number }[]
    >`select count(*)::int as n from pgboss.job where name = 'terrain-ingest' and state = 'active'`;
    return {
      drill: 'kill -9 mid-ingestion',
      held: status === 'ready' && killedJob?.state !== 'active' && active?.n === 0,
      what: `killed while ingesting a 10 000² model; ${status} ${readyAfterS.toFixed(0)} s after the kill; the killed job is ${killedJob?.state ?? 'gone'}, ${active?.n ?? '?'} ingestion job(s) left active`,
    };
  } finally {
    await sql.end();
  }
}

async function killMidNetworkRun(instance: ScratchInstance, cookies: Cookies): Promise<Outcome> {
  const scenarios = 16;
  const presets = (await (await fetch(`${instance.baseUrl}/api/vehicles`, { headers: { Cookie: cookies.planner } })).json()) as {
    items: { id: string }[];
  };
  for (let i = 0; i < scenarios; i++) {
    const coordinates = Array.from({ length: 61 }, (_, k) => [9.5 + (k / 60) * 0.7, 46.5 + i * 0.01, 1900 - k * 20]);
    const route = (await post(instance, cookies.planner, '/api/routes', {
      name: `Drill line ${i + 1}`,
      geometry: { type: 'LineString', coordinates },
    })) as { id: string };
    await post(instance, cookies.planner, '/api/scenarios', {
      name: `Drill scenario ${i + 1}`,
      routeId: route.id,
      vehicleProfileId: presets.items[0]!.id,
      inService: true,
      options: { spacingM: 2 },
    });
  }
  const run = (await post(instance, cookies.analyst, '/api/batch-runs', {})) as { id: string };
  const sql = postgres(instance.databaseUrl, { max: 1, onnotice: () => undefined });
  try {
    // Kill while an item is running, a few items into the run.
    let done = 0;
    let running = 0;
    while (done < 2 || running === 0) {
      await sleep(25);
      [{ done, running } = { done: 0, running: 0 }] = await sql<{ done: number; running: number }[]>`
        select count(*) filter (where status = 'done')::int as done, count(*) filter (where status = 'running')::int as running
        from batch_run_items where batch_run_id = ${run.id}`;
    }
    await instance.kill('SIGKILL');
    const killedAt = Date.now();
    await instance.restart();
    let finished = false;
    while (!finished && Date.now() - killedAt < 300_000) {
      await sleep(2_000);
      const [row] = await sql<{ finished_at: Date | null }[]>`select finished_at from batch_runs where id = ${run.id}`;
      finished = row?.finished_at !== null;
    }
    const items = await sql<{ status: string }[]>`select status from batch_run_items where batch_run_id = ${run.id}`;
    const byStatus = items.reduce<Record<string, number>>((acc, item) => ({ ...acc, [item.status]: (acc[item.status] ?? 0) + 1 }), {});
    return {
      drill: 'kill -9 mid-network-run',
      held: finished && byStatus['done'] === scenarios,
      what: `killed with ${done} of ${scenarios} items done and ${running} running; run ${finished ? 'finished' : 'NOT finished'} ${((Date.now() - killedAt) / 1000).toFixed(0)} s after the kill: ${Object.entries(
        byStatus,
      )
        .map(([s, n]) => `${n} ${s}`)
        .join(', ')}`,
    };
  } finally {
    await sql.end();
  }
}

async function silentRelay(instance: ScratchInstance, cookies: Cookies): Promise<Outcome> {
  const invitee = `drill-${Date.now()}@scratch.example`;
  const invited = Date.now();
  await post(instance, cookies.admin, '/api/people', { email: invitee, name: 'Drill Invitee', role: 'board' });
  const sql = postgres(instance.databaseUrl, { max: 1, onnotice: () => undefined });
  try {
    let lastError: string | null = null;
    while (!lastError && Date.now() - invited < 120_000) {
      await sleep(500);
      [{ last_error: lastError } = { last_error: null }] = await sql<
        { last_error: string | null }[]
      >`select last_error from mail_outbox where to_address = ${invitee}`;
    }
    const gaveUpS = (Date.now() - invited) / 1000;
    await relay.switchToWorking();
    let sent = false;
    while (!sent && Date.now() - invited < 240_000) {
      await sleep(1_000);
      [{ sent } = { sent: false }] = await sql<
        { sent: boolean }[]
      >`select status = 'sent' as sent from mail_outbox where to_address = ${invitee}`;
    }
    await sleep(3_000);
    const deliveries = relay.deliveriesTo(invitee);
    return {
      drill: 'silent mail relay',
      held: lastError !== null && gaveUpS < 45 && sent && deliveries === 1,
      what: `the worker gave up on the silent relay after ${gaveUpS.toFixed(0)} s (${lastError ?? 'never'}); once the relay answered the invitation was ${sent ? 'sent' : 'NOT sent'}, delivered ${deliveries} time(s)`,
    };
  } finally {
    await sql.end();
  }
}

// Helpers

async function peopleFor(instance: ScratchInstance): Promise<Cookies> {
  const [planner] = await addPeople(instance, 'planner', 1);
  const [analyst] = await addPeople(instance, 'analyst', 1);
  const [admin] = await addPeople(instance, 'admin', 1);
  const [reader] = await addPeople(instance, 'board', 1);
  return {
    planner: await signIn(instance, planner!),
    analyst: await signIn(instance, analyst!),
    admin: await signIn(instance, admin!),
    reader: await signIn(instance, reader!),
  };
}

async function post(instance: ScratchInstance, cookie: string, path: string, body: object): Promise<unknown> {
  const response = await fetch(`${instance.baseUrl}${path}`, {
    method: 'POST',
    headers: { Cookie: cookie, 'Content-Type': 'application/json' },
    body: JSON.stringify(body),
  });
  if (!response.ok) throw new Error(`POST ${path} answered ${response.status}: ${await response.text()}`);
  return response.json();
}

async function count(instance: ScratchInstance, query: string): Promise<number> {
  const sql = postgres(instance.databaseUrl, { max: 1, onnotice: () => undefined });
  try {
    const [row] = await sql.unsafe<{ n: number }[]>(query);
    return row?.n ?? 0;
  } finally {
    await sql.end();
  }
}

function readdirSafe(path: string): string[] {
  return existsSync(path) ? readdirSync(path) : [];
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

/** An SMTP relay on one port: first one that greets and falls silent, then a working one that counts deliveries. */
class SwitchableRelay {
  private silent: ReturnType<typeof createServer> | null = null;
  private readonly sockets = new Set<Socket>();
  private working: SMTPServer | null = null;
  private readonly received: string[] = [];

  constructor(private readonly port: number) {}

  async listenSilent(): Promise<void> {
    this.silent = createServer((socket) => {
      this.sockets.add(socket);
      socket.on('error', () => undefined);
      socket.write('220 drill-relay ESMTP\r\n');
    });
    await new Promise<void>((resolve) => this.silent!.listen(this.port, '127.0.0.1', resolve));
  }

  async switchToWorking(): Promise<void> {
    for (const socket of this.sockets) socket.destroy();
    await new Promise<void>((resolve) => this.silent?.close(() => resolve()) ?? resolve());
    this.silent = null;
    this.working = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS', 'AUTH'],
      logger: false,
      onRcptTo: (address, _session, callback) => {
        this.received.push(address.address);
        callback();
      },
      onData: (stream, _session, callback) => {
        stream.resume();
        stream.on('end', () => callback());
      },
    });
    await new Promise<void>((resolve) => this.working!.listen(this.port, '127.0.0.1', () => resolve()));
  }

  deliveriesTo(address: string): number {
    return this.received.filter((to) => to === address).length;
  }

  async close(): Promise<void> {
    for (const socket of this.sockets) socket.destroy();
    await new Promise<void>((resolve) => (this.silent ? this.silent.close(() => resolve()) : resolve()));
    await new Promise<void>((resolve) => (this.working ? this.working.close(() => resolve()) : resolve()));
  }
}

async function main(): Promise<void> {
  const wanted = process.argv.slice(2).length ? process.argv.slice(2) : Object.keys(DRILLS);
  const relayPort = await freePort();
  relay = new SwitchableRelay(relayPort);
  await relay.listenSilent();
  const instance = await startScratchInstance('descentry_drill', { SMTP_PORT: String(relayPort), MAIL_FAKE: 'false' });
  const outcomes: Outcome[] = [];
  try {
    const cookies = await peopleFor(instance);
    for (const name of wanted) {
      const drill = DRILLS[name];
      if (!drill) throw new Error(`No drill "${name}"; choose from ${Object.keys(DRILLS).join(', ')}`);
      process.stdout.write(`▶ ${name} … `);
      let outcome: Outcome;
      try {
        outcome = await drill(instance, cookies);
      } catch (error) {
        outcome = { drill: name, held: false, what: `the drill itself failed: ${error instanceof Error ? error.message : String(error)}` };
      }
      outcomes.push(outcome);
      console.log(outcome.held ? 'held' : 'DID NOT HOLD');
      if (instance.server.exitCode !== null || instance.server.signalCode !== null) await instance.restart();
    }
  } finally {
    await instance.stop();
    await relay.close();
  }
  console.log('\n| drill | what happened | held |');
  console.log('| --- | --- | --- |');
  for (const outcome of outcomes) console.log(`| ${outcome.drill} | ${outcome.what} | ${outcome.held ? 'yes' : '**no**'} |`);
  console.log(`\n${outcomes.filter((o) => o.held).length} of ${outcomes.length} drills held`);
  process.exit(outcomes.every((o) => o.held) ? 0 : 1);
}

let relay: SwitchableRelay;
await main();
