#!/usr/bin/env node
// `npm start`: everything a fresh machine needs, then the app on one port.
//   installs npm packages and Debian's PostgreSQL + PostGIS + pgRouting and osm2pgsql when missing, starts the private
//   cluster, migrates, loads the invented demo, builds the web app and the API, starts the local
//   mail catcher, serves http://127.0.0.1:4300 (PORT to change) and prints the demo sign-ins.
import { databaseUrl, startDatabase, stopDatabase } from './db.mjs';
import {
  OSM_IMPORT,
  ensureDebianPackages,
  ensureNodeModules,
  localSessionSecret,
  runStep,
  startServer,
  step,
  stopChild,
} from './stack.mjs';

const port = Number(process.env.PORT ?? 4300);
const smtpPort = Number(process.env.SMTP_PORT ?? 2525);

ensureNodeModules();
ensureDebianPackages(OSM_IMPORT);
step('Starting PostgreSQL (private cluster on 127.0.0.1)');
const pg = startDatabase(['descentry']);

const env = {
  NODE_ENV: 'development',
  PORT: String(port),
  PUBLIC_URL: process.env.PUBLIC_URL ?? `http://127.0.0.1:${port}`,
  DATABASE_URL: process.env.DATABASE_URL ?? databaseUrl('descentry'),
  SESSION_SECRET: process.env.SESSION_SECRET ?? localSessionSecret(),
  MAIL_FAKE: process.env.MAIL_FAKE ?? 'true',
  SMTP_PORT: String(smtpPort),
};

step('Building the web app and the API');
if (runStep('npm', ['run', 'build']).status !== 0) process.exit(1);

step('Migrating and loading the demo');
if (runStep(process.execPath, ['--import', 'tsx', 'api/demo/seed-cli.ts'], { env }).status !== 0) process.exit(1);

step('Starting the server');
let server = await startServer(env);
console.log(`
  Descentry is running at ${env.PUBLIC_URL}
  PostgreSQL: 127.0.0.1:${pg.port} (cluster in ${pg.dir})
  Local mail catcher: 127.0.0.1:${smtpPort} (admin → Outgoing mail)
  Press Ctrl+C to stop.
`);

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  await stopChild(server);
  if (process.env.KEEP_DB !== 'true') stopDatabase();
  process.exit(0);
}
process.on('SIGINT', stop);
process.on('SIGTERM', stop);

// A server that stops on its own is started again (the database keeps running): what it left
// half-done is picked up by its start-up recovery. Five stops within ten minutes mean something
// is wrong that a restart will not fix, so then everything stops.
const RESTARTS_ALLOWED = 5;
const RESTART_WINDOW_MS = 10 * 60_000;
const recentStops = [];
function superviseServer() {
  server.on('exit', async (code, signal) => {
    if (stopping) return;
    const now = Date.now();
    recentStops.push(now);
    while (recentStops[0] < now - RESTART_WINDOW_MS) recentStops.shift();
    console.error(`The server stopped (${signal ?? `exit code ${code}`}).`);
    if (recentStops.length > RESTARTS_ALLOWED) {
      console.error(`It stopped ${recentStops.length} times in ten minutes; stopping everything. See the messages above.`);
      stopDatabase();
      process.exit(code ?? 1);
    }
    console.error('Starting it again…');
    await new Promise((resolve) => setTimeout(resolve, 2_000));
    try {
      server = await startServer(env);
      superviseServer();
      console.error(`Descentry is running again at ${env.PUBLIC_URL}`);
    } catch (error) {
      console.error(`It did not start again: ${error instanceof Error ? error.message : error}`);
      stopDatabase();
      process.exit(1);
    }
  });
}
superviseServer();
