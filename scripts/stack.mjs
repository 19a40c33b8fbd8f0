// Shared steps of the start and test commands: install what is missing, start PostgreSQL, run
// and stop child processes, find free ports.
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const rootDir = resolve(dirname(fileURLToPath(import.meta.url)), '..');

export function step(message) {
  process.stdout.write(`\n▶ ${message}\n`);
}

/** `npm ci` when node_modules is missing or older than the lock file. */
export function ensureNodeModules() {
  const marker = join(rootDir, 'node_modules', '.package-lock.json');
  const lock = join(rootDir, 'package-lock.json');
  const stale = !existsSync(marker) || readFileSync(marker, 'utf8').length === 0 || statMtime(lock) > statMtime(marker);
  if (!stale) return;
  step('Installing npm packages (npm ci)');
  execFileSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: rootDir, stdio: 'inherit' });
}

function statMtime(path) {
  return existsSync(path) ? Number(execFileSync('stat', ['-c', '%Y', path]).toString().trim()) : 0;
}

/** Installs Debian packages whose marker file is missing (root only; otherwise explains). */
export function ensureDebianPackages(packages) {
  const missing = packages.filter(({ marker }) => !existsSync(marker)).map(({ name }) => name);
  if (missing.length === 0) return;
  if (process.getuid?.() !== 0) {
    throw new Error(`Missing Debian packages: ${missing.join(' ')}. Run: sudo apt-get install -y ${missing.join(' ')}`);
  }
  step(`Installing ${missing.join(', ')} from Debian's packages`);
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...missing], {
    stdio: 'inherit',
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
}

export const CHROMIUM = { name: 'chromium', marker: '/usr/bin/chromium' };
/** pdftotext -bbox and pdftoppm: the PDF layout tests read the word boxes of every rendered page. */
export const POPPLER = { name: 'poppler-utils', marker: '/usr/bin/pdftotext' };
export const GDAL = [
  { name: 'gdal-bin', marker: '/usr/bin/gdalinfo' },
  { name: 'python3-gdal', marker: '/usr/lib/python3/dist-packages/osgeo/__init__.py' },
];

/**
 * The base map's importer: osm2pgsql reads OpenStreetMap extracts into PostGIS (pgRouting, the
 * other engine, is installed with PostgreSQL by db.mjs); bzip2 unpacks .osm.bz2 extracts.
 */
export const OSM_IMPORT = [
  { name: 'osm2pgsql', marker: '/usr/bin/osm2pgsql' },
  { name: 'bzip2', marker: '/bin/bzip2' },
];
/**
 * The base map's reference checks: real OpenStreetMap extracts (python-osmnx-doc), the
 * independent shortest paths (python3-networkx, python3-geographiclib), and osmium-tool, which
 * writes the benchmark's .osm.pbf files.
 */
export const OSM_CHECKS = [
  { name: 'python-osmnx-doc', marker: '/usr/share/doc/python-osmnx-doc/examples/tests/input_data/West-Oakland.osm.bz2' },
  { name: 'python3-networkx', marker: '/usr/lib/python3/dist-packages/networkx/__init__.py' },
  { name: 'python3-geographiclib', marker: '/usr/lib/python3/dist-packages/geographiclib/__init__.py' },
  { name: 'osmium-tool', marker: '/usr/bin/osmium' },
];

/** A secret kept in .var/ so sessions survive restarts of the development server. */
export function localSessionSecret() {
  const path = join(rootDir, '.var', 'session-secret');
  if (!existsSync(path)) {
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(path, randomBytes(32).toString('hex'), { mode: 0o600 });
  }
  return readFileSync(path, 'utf8').trim();
}

export function freePort() {
  return new Promise((resolvePort, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address();
      server.close(() => resolvePort(port));
    });
  });
}

/** Runs a command in the foreground; returns its exit code and, when asked, its output. */
export function runStep(command, args, { env = {}, capture = false } = {}) {
  if (!capture) {
    const result = spawnSync(command, args, { cwd: rootDir, stdio: 'inherit', env: { ...process.env, ...env } });
    return { status: result.status ?? 1, output: '' };
  }
  return new Promise((resolveRun) => {
    const child = spawn(command, args, { cwd: rootDir, env: { ...process.env, ...env } });
    let output = '';
    child.stdout.on('data', (chunk) => {
      output += chunk;
      process.stdout.write(chunk);
    });
    child.stderr.on('data', (chunk) => {
      output += chunk;
      process.stderr.write(chunk);
    });
    child.on('close', (status) => resolveRun({ status: status ?? 1, output }));
  });
}

/** Starts the built API (dist/api/main.mjs) and waits until /api/health answers. */
export async function startServer(env, { logFile } = {}) {
  const child = spawn(process.execPath, ['dist/api/main.mjs'], {
    cwd: rootDir,
    env: { ...process.env, ...env },
    stdio: logFile ? ['ignore', 'pipe', 'pipe'] : 'inherit',
  });
  if (logFile) {
    mkdirSync(dirname(logFile), { recursive: true });
    const { createWriteStream } = await import('node:fs');
    const log = createWriteStream(logFile);
    child.stdout.pipe(log);
    child.stderr.pipe(log);
  }
  const url = `http://127.0.0.1:${env.PORT}/api/health`;
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The server exited with code ${child.exitCode}`);
    try {
      const response = await fetch(url);
      if (response.ok) return child;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  child.kill('SIGTERM');
  throw new Error(`The server did not answer ${url} within 60 s`);
}

export function stopChild(child) {
  return new Promise((resolveStop) => {
    if (!child || child.exitCode !== null) return resolveStop();
    child.once('exit', () => resolveStop());
    child.kill('SIGTERM');
    setTimeout(() => child.kill('SIGKILL'), 10_000).unref();
  });
}
