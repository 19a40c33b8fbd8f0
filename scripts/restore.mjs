#!/usr/bin/env node
// `npm run restore -- <backup folder> [--replace]`: puts a backup made by `npm run backup` back.
//
//   DATABASE_URL   the database to restore into (default: the development database of this
//                  checkout); it is created if missing
//   DATA_DIR       the data folder to restore into (default: .var/data)
//   --replace      drop and recreate a database that already holds tables, and empty a data
//                  folder that is not empty (without it the restore refuses, changing nothing)
//
// Stop the server first. The files are checked against the manifest's SHA-256 before anything is
// touched; afterwards the row counts of every table are compared with the backup's. The server
// applies any newer migrations when it starts.
import { existsSync, mkdirSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { DATABASE_FILE, DATA_FILE, MANIFEST_FILE, PG_BIN, connectionOf, runTool, sha256Of, tableCounts } from './backup-format.mjs';
import { databaseUrl, startDatabase } from './db.mjs';
import { rootDir } from './stack.mjs';

const args = process.argv.slice(2);
const replace = args.includes('--replace');
const source = args.find((arg) => !arg.startsWith('--'));
if (!source) {
  console.error('usage: npm run restore -- <backup folder> [--replace]');
  process.exit(2);
}
const folder = resolve(source);
const manifestPath = join(folder, MANIFEST_FILE);
if (!existsSync(manifestPath)) {
  console.error(`${folder} holds no ${MANIFEST_FILE}: not a backup made by npm run backup.`);
  process.exit(1);
}
const manifest = JSON.parse(readFileSync(manifestPath, 'utf8'));
for (const [name, expected] of Object.entries(manifest.files)) {
  const actual = await sha256Of(join(folder, name));
  if (actual !== expected.sha256) {
    console.error(`${name} does not match the manifest (SHA-256 ${actual}, expected ${expected.sha256}); nothing was restored.`);
    process.exit(1);
  }
}

const url = process.env.DATABASE_URL ?? (startDatabase([]), databaseUrl('descentry'));
const dataDir = resolve(rootDir, process.env.DATA_DIR ?? '.var/data');
const { args: connection, database, password } = connectionOf(url);
const psqlAdmin = (sql) => runTool('psql', [...connection, '-d', 'postgres', '-v', 'ON_ERROR_STOP=1', '-tAc', sql], { password }).trim();

const exists = psqlAdmin(`select 1 from pg_database where datname = '${database.replace(/'/g, "''")}'`) === '1';
if (exists) {
  const tables = runTool(
    'psql',
    [
      ...connection,
      '-d',
      database,
      '-tAc',
      "select count(*) from information_schema.tables where table_schema in ('public', 'pgboss') and table_name <> 'spatial_ref_sys'",
    ],
    { password },
  ).trim();
  if (Number(tables) > 0 && !replace) {
    console.error(`The database ${database} already holds ${tables} tables; add --replace to drop it and restore the backup in its place.`);
    process.exit(1);
  }
}
const dataNotEmpty = existsSync(dataDir) && readdirSync(dataDir).length > 0;
if (dataNotEmpty && !replace) {
  console.error(`${dataDir} is not empty; add --replace to empty it and restore the backup's files in its place.`);
  process.exit(1);
}

if (exists) psqlAdmin(`drop database "${database}" with (force)`);
psqlAdmin(`create database "${database}"`);
runTool(
  `${PG_BIN}/pg_restore`,
  [...connection, '--no-owner', '--no-privileges', '--exit-on-error', '-d', database, join(folder, DATABASE_FILE)],
  { password },
);

if (dataNotEmpty) rmSync(dataDir, { recursive: true, force: true });
mkdirSync(dataDir, { recursive: true });
runTool('tar', ['--extract', '--gzip', '--file', join(folder, DATA_FILE), '--directory', dataDir]);

const counts = tableCounts(url);
const differences = Object.entries(manifest.tables).filter(([table, rows]) => counts[table] !== rows);
if (differences.length > 0) {
  console.error(
    `Restored, but these tables differ from the backup: ${differences.map(([t, n]) => `${t} (${counts[t]} rows, backup ${n})`).join(', ')}`,
  );
  process.exit(1);
}
const rows = Object.values(counts).reduce((sum, n) => sum + n, 0);
console.log(
  `Restored ${folder} (taken ${manifest.createdAt}) into ${database} (${rows} rows, every table as in the backup) and ${dataDir}.`,
);
