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
  /** Give up connecting to PostgreSQL after this long, s; requests meanwhile get 503 with Retry-After. */
  DB_CONNECT_TIMEOUT_S: z.coerce.number().int().min(1).max(120).default(5),
  /** PostgreSQL cancels a statement running longer than this, ms (the request gets 503). */
  DB_STATEMENT_TIMEOUT_MS: z.coerce.number().int().min(100).max(3_600_000).default(30_000),
  /** Secret for signing session tokens; at least 32 characters. */
  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters'),
  /** Session lifetime; renewed on activity. */
  SESSION_TTL_MINUTES: z.coerce
    .number()
    .int()
    .min(1)
    .max(24 * 60)
    .default(30),
  /**
   * Which proxies may tell the client's address (X-Forwarded-For) and protocol: "false" (the
   * default: nobody, the socket's address counts), a number of proxy hops, or a comma-separated
   * list of addresses/subnets ("loopback", "10.0.0.0/8"). Set it only when a proxy you run sits
   * in front; otherwise anyone could pick the address the sign-in limits count.
   */
  TRUST_PROXY: z
    .string()
    .default('false')
    .transform((value, ctx): boolean | number | string[] => {
      const text = value.trim();
      if (text === '' || text === 'false') return false;
      if (text === 'true') return true;
      if (/^\d+$/.test(text)) return Number(text);
      const list = text
        .split(',')
        .map((part) => part.trim())
        .filter(Boolean);
      if (list.some((part) => !/^[\w.:/]+$/.test(part))) {
        ctx.addIssue({ code: 'custom', message: 'give false, a hop count, or a comma-separated list of addresses or subnets' });
        return z.NEVER;
      }
      return list;
    }),
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
  TERRAIN_MAX_UPLOAD_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(2 * 1024 ** 3),
  /** Largest terrain grid accepted, width × height pixels (guards against decompression bombs). */
  TERRAIN_MAX_PIXELS: z.coerce.number().int().positive().default(1_000_000_000),
  /** Largest single decoded tile or strip, bytes; bigger blocks would have to be held whole. */
  TERRAIN_MAX_BLOCK_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(64 * 1024 ** 2),
  /** Memory for decoded terrain blocks shared by sampling and tile rendering, MiB. */
  TERRAIN_BLOCK_CACHE_MB: z.coerce.number().int().positive().default(256),
  /** Worker threads that decode terrain blocks off the event loop. */
  TERRAIN_DECODE_THREADS: z.coerce.number().int().min(1).max(16).default(2),
  /** Disk space for rendered map tiles, MiB; the least recently used tiles go first. */
  TILE_CACHE_MAX_MB: z.coerce.number().int().min(1).default(1024),
  /** Largest OpenStreetMap extract accepted for the base map, bytes (default 4 GiB); larger uploads get 413. */
  BASEMAP_MAX_UPLOAD_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(4 * 1024 ** 3),
  /** Memory osm2pgsql may use for node positions during an import, MiB (beyond it they go to PostgreSQL). */
  BASEMAP_IMPORT_CACHE_MB: z.coerce.number().int().min(16).max(65_536).default(256),
  /** Processes osm2pgsql may use for an import (its indexing phase runs in parallel). */
  BASEMAP_IMPORT_PROCESSES: z.coerce.number().int().min(1).max(16).default(1),
  /** Memory for rendered base-map tiles, MiB (least recently used go first). */
  BASEMAP_TILE_CACHE_MB: z.coerce.number().int().positive().default(64),
  /** Run the background workers (mail outbox, jobs) in this process. */
  RUN_WORKERS: z.stringbool().default(true),
  /** Worker threads that run route analyses off the event loop. */
  ANALYSIS_THREADS: z.coerce.number().int().min(1).max(32).default(2),
  /** Analyses that may wait for a thread; past it the API answers 503 with Retry-After. */
  ANALYSIS_MAX_QUEUE: z.coerce.number().int().min(1).max(10_000).default(32),
  /** Heap of one analysis thread, MiB; an analysis that needs more ends its thread, not the API. */
  ANALYSIS_WORKER_HEAP_MB: z.coerce.number().int().min(64).max(16_384).default(512),
  /** Analyses, imports and reports one person may have running at once; more get 429. */
  HEAVY_REQUESTS_PER_PERSON: z.coerce.number().int().min(1).max(100).default(2),
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
