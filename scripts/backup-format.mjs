// What a backup folder holds, shared by `npm run backup` and `npm run restore`:
//
//   database.dump    pg_dump custom format of the application's database (tables, the job queue
//                    schema, PostGIS data), restorable with pg_restore
//   data.tar.gz      DATA_DIR: uploaded terrain models and their pyramids (the tile cache and
//                    half-received uploads are left out: both are rebuilt or useless)
//   manifest.json    when, from which database, the PostgreSQL tools' version, row counts per table
//                    and the SHA-256 of both files, checked before anything is restored
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { spawnSync } from 'node:child_process';

export const DATABASE_FILE = 'database.dump';
export const DATA_FILE = 'data.tar.gz';
export const MANIFEST_FILE = 'manifest.json';
/** Debian's PostgreSQL 15 tools, the same major version as the server (pg_dump refuses a newer server). */
export const PG_BIN = '/usr/lib/postgresql/15/bin';

export function sha256Of(path) {
  return new Promise((resolve, reject) => {
    const hash = createHash('sha256');
    createReadStream(path)
      .on('data', (chunk) => hash.update(chunk))
      .on('end', () => resolve(hash.digest('hex')))
      .on('error', reject);
  });
}

/** Runs a tool, handing it the database password through the environment; throws with its stderr. */
export function runTool(command, args, { password, input } = {}) {
  const result = spawnSync(command, args, {
    encoding: 'utf8',
    input,
    env: { ...process.env, ...(password ? { PGPASSWORD: password } : {}) },
    maxBuffer: 64 * 1024 * 1024,
  });
  if (result.status !== 0) throw new Error(`${command} ${args.join(' ')} failed:\n${result.stderr || result.stdout}`);
  return result.stdout;
}

/** Connection options for the PostgreSQL tools from a postgres:// URL (the password goes separately). */
export function connectionOf(databaseUrl) {
  const url = new URL(databaseUrl);
  return {
    args: ['-h', url.hostname, '-p', url.port || '5432', '-U', decodeURIComponent(url.username)],
    database: decodeURIComponent(url.pathname.slice(1)),
    password: decodeURIComponent(url.password),
  };
}

/** Rows per application table (public schema), to compare a restore with its backup. */
export function tableCounts(databaseUrl) {
  const { args, database, password } = connectionOf(databaseUrl);
  const sql = `select string_agg(format('%s=%s', table_name,
      (xpath('/row/c/text()', query_to_xml(format('select count(*) as c from public.%I', table_name), false, true, '')))[1]::text), ';' order by table_name)
    from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' and table_name <> 'spatial_ref_sys'`;
  const out = runTool('psql', [...args, '-d', database, '-tAc', sql], { password }).trim();
  return Object.fromEntries(
    out
      .split(';')
      .filter(Boolean)
      .map((pair) => {
        const [name, count] = pair.split('=');
        return [name, Number(count)];
      }),
  );
}
