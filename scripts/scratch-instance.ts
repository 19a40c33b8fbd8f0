/**
 * A throw-away Descentry for the load benchmark and the fault drills: its own database in this
 * checkout's private PostgreSQL cluster (recreated each time), its own data folder, the built
 * server (dist/api/main.mjs, `npm run build:api` first) on a free port, and people to sign in as.
 * Runs from any checkout, older ones included, so figures can be compared before and after.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { mkdirSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';
import { hash } from '@node-rs/argon2';
import postgres from 'postgres';
// @ts-expect-error: plain JavaScript module of the project's scripts
import { databaseUrl, ensureDatabase, pgSettings, startDatabase } from './db.mjs';
import { LADEN_12M_BUS } from '../spec/support/vehicle-fixtures';

export const SCRATCH_PASSWORD = 'scratch-instance-password';

export interface ScratchInstance {
  baseUrl: string;
  databaseUrl: string;
  dataDir: string;
  env: Record<string, string>;
  server: ChildProcess;
  /** Starts the server again (after a kill) with the same settings; resolves once it answers. */
  restart(extraEnv?: Record<string, string>): Promise<void>;
  /** Sends the server a signal and waits for it to exit. */
  kill(signal?: NodeJS.Signals): Promise<void>;
  stop(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolve(port));
    });
  });
}

/** Drops and creates the database, starts the server against it. */
export async function startScratchInstance(name: string, extraEnv: Record<string, string> = {}): Promise<ScratchInstance> {
  startDatabase([]);
  const sql = postgresAdmin();
  await sql.unsafe(`drop database if exists "${name}" with (force)`);
  await sql.end();
  ensureDatabase(name);
  const dataDir = join(process.cwd(), '.var', `${name}-data`);
  rmSync(dataDir, { recursive: true, force: true });
  mkdirSync(dataDir, { recursive: true });
  const port = await freePort();
  const env: Record<string, string> = {
    NODE_ENV: 'development',
    PORT: String(port),
    PUBLIC_URL: `http://127.0.0.1:${port}`,
    DATABASE_URL: databaseUrl(name),
    SESSION_SECRET: 'scratch-secret-scratch-secret-scratch-00',
    DATA_DIR: dataDir,
    WEB_DIR: '',
    MAIL_FAKE: 'false',
    SMTP_PORT: String(await freePort()),
    ...extraEnv,
  };
  let current: ChildProcess;
  const launch = async (more: Record<string, string> = {}) => {
    // SCRATCH_NODE_ARGS: extra Node flags for the server, e.g. `--cpu-prof --cpu-prof-dir=…` to profile it.
    const nodeArgs = (process.env['SCRATCH_NODE_ARGS'] ?? '').split(' ').filter(Boolean);
    current = spawn(process.execPath, [...nodeArgs, 'dist/api/main.mjs'], {
      env: { ...process.env, ...env, ...more },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    current.stdout?.on('data', () => undefined);
    current.stderr?.on('data', () => undefined);
    await waitForHealth(`http://127.0.0.1:${port}`, current);
  };
  await launch();
  const instance: ScratchInstance = {
    baseUrl: `http://127.0.0.1:${port}`,
    databaseUrl: databaseUrl(name),
    dataDir,
    env,
    get server() {
      return current;
    },
    restart: launch,
    kill: (signal = 'SIGKILL') =>
      new Promise<void>((resolve) => {
        if (current.exitCode !== null || current.signalCode !== null) return resolve();
        current.once('exit', () => resolve());
        current.kill(signal);
      }),
    async stop() {
      await instance.kill('SIGTERM');
      const admin = postgresAdmin();
      await admin.unsafe(`drop database if exists "${name}" with (force)`);
      await admin.end();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
  return instance;
}

/** Inserts `count` active people of `role` (password SCRATCH_PASSWORD); returns their e-mails. */
export async function addPeople(instance: ScratchInstance, role: string, count: number): Promise<string[]> {
  const passwordHash = await hash(SCRATCH_PASSWORD, { algorithm: 2, memoryCost: 19_456, timeCost: 2, parallelism: 1 });
  const sql = postgres(instance.databaseUrl, { max: 1, onnotice: () => undefined });
  const emails = Array.from({ length: count }, (_, i) => `${role}-${i + 1}-${Date.now()}@scratch.example`);
  for (const [i, email] of emails.entries()) {
    await sql`insert into users (email, name, role, status, password_hash) values (${email}, ${`Scratch ${role} ${i + 1}`}, ${role}, 'active', ${passwordHash})`;
  }
  await sql.end();
  return emails;
}

/** Signs in through the API (as someone `addPeople` made, or with `password`); returns the Cookie header value. */
export async function signIn(instance: ScratchInstance, email: string, password = SCRATCH_PASSWORD): Promise<string> {
  const response = await fetch(`${instance.baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (!response.ok) throw new Error(`sign-in as ${email}: ${response.status} ${await response.text()}`);
  return response.headers
    .getSetCookie()
    .map((cookie) => cookie.split(';')[0])
    .join('; ');
}

export async function waitForHealth(baseUrl: string, child?: ChildProcess, timeoutMs = 90_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child && (child.exitCode !== null || child.signalCode !== null))
      throw new Error(`the server exited (${child.exitCode ?? child.signalCode})`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) return;
    } catch {
      // Expected while the server starts: nothing listens yet.
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`${baseUrl} did not answer within ${timeoutMs / 1000} s`);
}

/** Stops the private PostgreSQL cluster for `downtimeMs`, then starts it again: a database outage. */
export async function restartDatabaseCluster(downtimeMs: number): Promise<void> {
  const dataDir = join(pgSettings.dir, 'data');
  const asPostgres = process.getuid?.() === 0 ? ['runuser', '-u', 'postgres', '--'] : [];
  const pgCtl = (...args: string[]) => {
    const command = [...asPostgres, '/usr/lib/postgresql/15/bin/pg_ctl', '-D', dataDir, ...args];
    const result = spawnSync(command[0]!, command.slice(1), { encoding: 'utf8' });
    if (result.status !== 0) throw new Error(`pg_ctl ${args[0]} failed: ${result.stderr}`);
  };
  pgCtl('stop', '-m', 'fast', '-w');
  await new Promise((resolve) => setTimeout(resolve, downtimeMs));
  pgCtl('start', '-w', '-l', join(pgSettings.dir, 'server.log'));
}

function postgresAdmin() {
  return postgres(databaseUrl('postgres'), { max: 1, onnotice: () => undefined });
}

/**
 * Loads the invented demo into the scratch instance (about a minute) and starts the server again,
 * so it picks up the terrain and base map the seed imported.
 */
export async function loadDemo(instance: ScratchInstance): Promise<void> {
  const seed = spawnSync(process.execPath, ['--import', 'tsx', 'api/demo/seed-cli.ts'], {
    env: { ...process.env, ...instance.env },
    encoding: 'utf8',
  });
  if (seed.status !== 0) throw new Error(`demo seed failed: ${seed.stderr}`);
  await instance.kill('SIGTERM');
  await instance.restart();
}

/**
 * The preview body the load benchmarks post: a straight descent of `routeKm` with its own
 * elevations (no terrain needed), 1 m spacing, for a laden 12 m battery bus.
 */
export function straightDescentPreview(routeKm: number) {
  const coordinates = Array.from({ length: 41 }, (_, i) => [9.5 + (i / 40) * (routeKm / 76.4), 46.5, 1800 - i * 30]);
  return {
    route: { type: 'LineString', coordinates },
    vehicle: LADEN_12M_BUS,
    options: { spacingM: 1 },
  };
}
