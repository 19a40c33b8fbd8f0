import { z } from 'zod';

/**
 * Process configuration, parsed once from the environment; a bad value stops start-up with a
 * message naming the variable.
 */
const configSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PORT: z.coerce.number().int().min(1).max(65535).default(4300),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z.string().min(1, 'DATABASE_URL is required'),
  /** Secret for signing session tokens; at least 32 characters. */
  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters'),
  /** Session lifetime; renewed on activity. */
  SESSION_TTL_MINUTES: z.coerce.number().int().min(1).max(24 * 60).default(30),
  /** Public address of the app, used in links inside e-mails and for the Origin check. */
  PUBLIC_URL: z.url().default('http://127.0.0.1:4300'),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: z.stringbool().default(false),
  MAIL_FROM: z.string().default('Descentry <no-reply@descentry.example>'),
  /** Start the local SMTP fake inside this process (development only). */
  MAIL_FAKE: z.stringbool().default(false),
  /** Folder for uploaded terrain and rendered tiles. */
  DATA_DIR: z.string().default('.var/data'),
  /** Folder with the built Angular app to serve; empty to serve the API only. */
  WEB_DIR: z.string().default('dist/web/browser'),
  /** Largest terrain upload accepted, bytes (default 2 GiB); larger uploads get 413. */
  TERRAIN_MAX_UPLOAD_BYTES: z.coerce.number().int().positive().default(2 * 1024 ** 3),
  /** Largest terrain grid accepted, width × height pixels (guards against decompression bombs). */
  TERRAIN_MAX_PIXELS: z.coerce.number().int().positive().default(1_000_000_000),
  /** Largest single decoded tile or strip, bytes; bigger blocks would have to be held whole. */
  TERRAIN_MAX_BLOCK_BYTES: z.coerce.number().int().positive().default(64 * 1024 ** 2),
  /** Memory for decoded terrain blocks shared by sampling and tile rendering, MiB. */
  TERRAIN_BLOCK_CACHE_MB: z.coerce.number().int().positive().default(256),
  /** Worker threads that decode terrain blocks off the event loop. */
  TERRAIN_DECODE_THREADS: z.coerce.number().int().min(1).max(16).default(2),
  /** Largest OpenStreetMap extract accepted for the base map, bytes (default 4 GiB); larger uploads get 413. */
  BASEMAP_MAX_UPLOAD_BYTES: z.coerce.number().int().positive().default(4 * 1024 ** 3),
  /** Memory osm2pgsql may use for node positions during an import, MiB (beyond it they go to PostgreSQL). */
  BASEMAP_IMPORT_CACHE_MB: z.coerce.number().int().min(16).max(65_536).default(256),
  /** Processes osm2pgsql may use for an import (its indexing phase runs in parallel). */
  BASEMAP_IMPORT_PROCESSES: z.coerce.number().int().min(1).max(16).default(1),
  /** Memory for rendered base-map tiles, MiB (least recently used go first). */
  BASEMAP_TILE_CACHE_MB: z.coerce.number().int().positive().default(64),
  /** Run the background workers (mail outbox, jobs) in this process. */
  RUN_WORKERS: z.stringbool().default(true),
});

export type Config = z.infer<typeof configSchema>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = configSchema.safeParse(env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`);
    throw new Error(`Invalid configuration:\n  ${problems.join('\n  ')}`);
  }
  return parsed.data;
}
