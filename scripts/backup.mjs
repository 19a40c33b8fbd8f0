#!/usr/bin/env node
// `npm run backup [-- <folder>]`: a consistent copy of the database and the data folder.
//
//   DATABASE_URL   the database to copy (default: the development database of this checkout)
//   DATA_DIR       the data folder to copy (default: .var/data)
//   <folder>       where to write (default: backups/<UTC time>)
//
// The database is copied with Debian's pg_dump (one snapshot, taken while the service runs);
// the data folder with tar. Terrain files are written once and never changed, so a copy taken
// after the database snapshot holds every file the snapshot refers to. See backup-format.mjs.
import { existsSync, mkdirSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { DATABASE_FILE, DATA_FILE, MANIFEST_FILE, PG_BIN, connectionOf, runTool, sha256Of, tableCounts } from './backup-format.mjs';
import { databaseUrl, startDatabase } from './db.mjs';
import { rootDir } from './stack.mjs';

const url = process.env.DATABASE_URL ?? (startDatabase(['descentry']), databaseUrl('descentry'));
const dataDir = resolve(rootDir, process.env.DATA_DIR ?? '.var/data');
const stamp = new Date().toISOString().replace(/[:.]/g, '-');
const target = resolve(process.argv[2] ?? join(rootDir, 'backups', stamp));

if (existsSync(target) && existsSync(join(target, MANIFEST_FILE))) {
  console.error(`${target} already holds a backup; give another folder.`);
  process.exit(1);
}
mkdirSync(target, { recursive: true });

const { args, database, password } = connectionOf(url);
const counts = tableCounts(url);
runTool(
  `${PG_BIN}/pg_dump`,
  [...args, '--format=custom', '--no-owner', '--no-privileges', '--file', join(target, DATABASE_FILE), database],
  { password },
);

const dataPath = join(target, DATA_FILE);
if (existsSync(dataDir)) {
  runTool('tar', ['--create', '--gzip', '--file', dataPath, '--directory', dataDir, '--exclude=./tiles', '--exclude=./uploads', '.']);
} else {
  runTool('tar', ['--create', '--gzip', '--file', dataPath, '--files-from', '/dev/null']);
}

const manifest = {
  createdAt: new Date().toISOString(),
  database,
  dataDir,
  pgDump: runTool(`${PG_BIN}/pg_dump`, ['--version']).trim(),
  tables: counts,
  files: {
    [DATABASE_FILE]: { bytes: statSync(join(target, DATABASE_FILE)).size, sha256: await sha256Of(join(target, DATABASE_FILE)) },
    [DATA_FILE]: { bytes: statSync(dataPath).size, sha256: await sha256Of(dataPath) },
  },
};
writeFileSync(join(target, MANIFEST_FILE), `${JSON.stringify(manifest, null, 2)}\n`);
const rows = Object.values(counts).reduce((sum, n) => sum + n, 0);
console.log(`Backup written to ${target}: ${database} (${rows} rows in ${Object.keys(counts).length} tables) and ${dataDir}.`);
