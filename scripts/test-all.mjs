#!/usr/bin/env node
// `npm test`: every test, on a fresh machine too. Installs what is missing (npm packages,
// PostgreSQL + PostGIS + pgRouting, osm2pgsql, Chromium, GDAL, poppler-utils, the OpenStreetMap
// reference data and networkx), starts the private PostgreSQL, recreates the test
// databases, then runs: ESLint (must report no problem), Prettier's check, the type check, the Node tests (engine + API, vitest), the Angular unit tests (ng test),
// and the browser tests against a freshly built and seeded server. Prints one summary line.
import { databaseUrl, ensureDatabase, startDatabase, stopDatabase, pgSettings } from './db.mjs';
import { spawnSync } from 'node:child_process';
import {
  CHROMIUM,
  GDAL,
  POPPLER,
  OSM_CHECKS,
  OSM_IMPORT,
  ensureDebianPackages,
  ensureNodeModules,
  freePort,
  runStep,
  startServer,
  step,
  stopChild,
} from './stack.mjs';

const started = Date.now();
const results = [];

ensureNodeModules();
ensureDebianPackages([CHROMIUM, POPPLER, ...GDAL, ...OSM_IMPORT, ...OSM_CHECKS]);
step('Starting PostgreSQL (private cluster on 127.0.0.1)');
startDatabase([]);
for (const database of ['descentry_test', 'descentry_e2e']) recreateDatabase(database);

const testEnv = {
  NODE_ENV: 'test',
  DATABASE_URL: databaseUrl('descentry_test'),
  SESSION_SECRET: 'test-secret-test-secret-test-secret-0000',
};

step('Lint (ESLint, eslint.config.mjs)');
recordLint(await runStep('npx', ['eslint', '.', '--max-warnings', '0'], { capture: true }));

step('Formatting (Prettier, .prettierrc.json)');
recordFormat(await runStep('npx', ['prettier', '--check', '.'], { capture: true }));

step('Type check (the API and every test file: npm run typecheck)');
recordTypes(await runStep('npm', ['run', 'typecheck'], { capture: true }));

step('Node tests: calculation engine and API (vitest)');
record('node', await runStep('npx', ['vitest', 'run', '--config', 'spec/vitest.config.ts'], { env: testEnv, capture: true }));

step('Angular unit tests (ng test)');
record('web', await runStep('npx', ['ng', 'test', '--watch=false'], { env: { CI: 'true' }, capture: true }));

step('Browser tests (Chromium, headless)');
await runBrowserTests();

stopDatabase();
const passed = results.reduce((sum, r) => sum + r.passed, 0);
const failed = results.reduce((sum, r) => sum + r.failed, 0);
const broken = results.filter((r) => r.status !== 0).map((r) => r.name);
const minutes = ((Date.now() - started) / 60_000).toFixed(1);
console.log(`\nSuites: ${results.map((r) => `${r.name} ${r.passed}/${r.passed + r.failed}`).join(', ')} in ${minutes} min`);
if (broken.length) console.log(`Suites that failed: ${broken.join(', ')}`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(broken.length || failed ? 1 : 0);

async function runBrowserTests() {
  const build = runStep('npm', ['run', 'build']);
  if (build.status !== 0) {
    results.push({ name: 'browser', status: 1, passed: 0, failed: 1 });
    return;
  }
  const port = await freePort();
  const smtpPort = await freePort();
  const env = {
    NODE_ENV: 'development',
    PORT: String(port),
    PUBLIC_URL: `http://127.0.0.1:${port}`,
    DATABASE_URL: databaseUrl('descentry_e2e'),
    SESSION_SECRET: 'e2e-secret-e2e-secret-e2e-secret-00000',
    MAIL_FAKE: 'true',
    SMTP_PORT: String(smtpPort),
    DATA_DIR: '.var/e2e-data',
  };
  if (runStep(process.execPath, ['--import', 'tsx', 'api/demo/seed-cli.ts'], { env }).status !== 0) {
    results.push({ name: 'browser', status: 1, passed: 0, failed: 1 });
    return;
  }
  const server = await startServer(env, { logFile: 'spec-artifacts/e2e-server.log' });
  try {
    record(
      'browser',
      await runStep(process.execPath, ['--import', 'tsx', 'spec/browser/run-browser-tests.ts'], {
        env: { BASE_URL: env.PUBLIC_URL, DATABASE_URL: env.DATABASE_URL },
        capture: true,
      }),
    );
  } finally {
    await stopChild(server);
  }
}

/** ESLint counts as one passed check when clean; otherwise each reported problem is a failure. */
function recordLint({ status, output }) {
  const problems = Number(/(\d+) problems?/.exec(output)?.[1] ?? 0);
  results.push({ name: 'lint', status, passed: status === 0 ? 1 : 0, failed: status === 0 ? 0 : Math.max(1, problems) });
}

/** Prettier counts as one passed check when every file is formatted; otherwise each unformatted file is a failure. */
function recordFormat({ status, output }) {
  const unformatted = output.split('\n').filter((line) => line.startsWith('[warn] ') && !line.includes('Code style issues')).length;
  results.push({ name: 'format', status, passed: status === 0 ? 1 : 0, failed: status === 0 ? 0 : Math.max(1, unformatted) });
}

// vitest and the browser tests strip types without checking them, so a test file's type error
// would otherwise pass unseen.
function recordTypes({ status, output }) {
  const errors = output.split('\n').filter((line) => /error TS\d+:/.test(line)).length;
  results.push({ name: 'types', status, passed: status === 0 ? 1 : 0, failed: status === 0 ? 0 : Math.max(1, errors) });
}

function recreateDatabase(database) {
  const sql = `DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`;
  const dropped = spawnSync(
    'psql',
    ['-h', '127.0.0.1', '-p', String(pgSettings.port), '-U', pgSettings.user, '-d', 'postgres', '-tAc', sql],
    { encoding: 'utf8', env: { ...process.env, PGPASSWORD: pgSettings.password } },
  );
  if (dropped.status !== 0) throw new Error(dropped.stderr);
  ensureDatabase(database);
}

/** Reads the runner's own closing counts: vitest "Tests  N passed", node:test "pass N". */
function record(name, { status, output }) {
  // Strips ANSI colour codes, which start with the ESC control character.
  // eslint-disable-next-line no-control-regex
  const plain = output.replace(/\x1b\[[0-9;]*m/g, '');
  let passed = 0;
  let failed = 0;
  const vitest = [...plain.matchAll(/^\s*Tests\s+(.*)\(\d+\)\s*$/gm)].at(-1);
  if (vitest) {
    passed = Number(/(\d+) passed/.exec(vitest[1])?.[1] ?? 0);
    failed = Number(/(\d+) failed/.exec(vitest[1])?.[1] ?? 0);
  } else {
    passed = Number([...plain.matchAll(/^[#ℹ]\s*pass (\d+)/gm)].at(-1)?.[1] ?? 0);
    failed = Number([...plain.matchAll(/^[#ℹ]\s*fail (\d+)/gm)].at(-1)?.[1] ?? 0);
  }
  if (status !== 0 && failed === 0) failed = 1;
  results.push({ name, status, passed, failed });
}
