import { brotliCompress, brotliCompressSync, constants as zlibConstants, gzipSync } from 'node:zlib';
import type { Request, RequestHandler, Response } from 'express';
import Negotiator from 'negotiator';
import type { Sql } from 'postgres';
import type { User } from '@shared/domain/auth';
import { AnnouncementLine } from '../db/announcement-line';
import { sizeOf } from './built-answers';

/**
 * PostgreSQL channel on which the database announces, at commit, every statement that changed one
 * of the application's tables (statement-level triggers, migration 0019): the table's name.
 * Heartbeats of the processes use it too (`p:<process>:<sequence>`).
 */
export const DATA_CHANGES_CHANNEL = 'descentry_data_changes';

/**
 * Tables whose changes no cached answer depends on, so they carry no announcing trigger: sign-in
 * bookkeeping, the append-only audit trail and the mail queue change on nearly every request and
 * would empty the cache for nothing. (Sessions and accounts have their own channel, for the
 * session cache.) spec/api/http/answer-cache.spec.ts fails when any other table lacks the trigger.
 */
export const UNANNOUNCED_TABLES = ['sessions', 'attempt_throttles', 'audit_log', 'mail_outbox', 'captured_mail'] as const;

/** The longest an answer is served from memory, ms, even when nothing announced a change. */
const ENTRY_TTL_MS = 60_000;
/** Answers kept at most; the oldest are dropped first. */
const MAX_ENTRIES = 500;
/** Answers below this many bytes go out uncompressed (as the API's compression middleware does). */
const COMPRESS_FROM_BYTES = 1024;

/**
 * Kept answers at least this large also get, once sent, a brotli copy at the best quality made on
 * libuv's threads (the next visits get that one). For a stored result of 290 kB of JSON: 77 kB at
 * the quality the first answer is sent with (5, ~25 ms), 55 kB at 11 (~0.4 s once, off the event
 * loop).
 */
export const BEST_BROTLI_FROM_BYTES = 64 * 1024;
/** Best-quality copies made at once at most (each holds a libuv thread for a fraction of a second). */
const BEST_BROTLI_AT_ONCE = 1;
let bestBrotliUnderWay = 0;

/** An answer kept in memory: its JSON and, once asked for, its compressed copies. */
export interface KeptAnswer {
  json: Buffer;
  gzip?: Buffer;
  br?: Buffer;
}

interface Entry extends KeptAnswer {
  storedAtMs: number;
}

/**
 * Whole answers of the busiest read endpoints (the lists: routes, scenarios, vehicle profiles),
 * kept in memory as JSON and compressed once, so a repeated read costs no query, no row mapping,
 * no serialisation and no compression. Authorization is untouched: an answer is looked up only
 * after `requireRole` let the caller in, and it is keyed by the caller's role and the full
 * address (path and query), so two callers share an answer only when they would be given the
 * same one. (Mark only endpoints whose answer depends on nothing else, `cachedAnswer: true`.)
 *
 * A change is seen on the very next read:
 * - in this process, every API write (any method but GET, HEAD, OPTIONS) empties the cache when it
 *   starts and again when its answer is done, and nothing read while a write is in flight, or
 *   begun before a change was heard, is stored;
 * - from any process or from the database itself (a job, a script, a hand-written query), the
 *   tables' triggers announce the change on DATA_CHANGES_CHANNEL at commit and every listening
 *   process empties its cache on hearing it; the cache answers only while that line is proven
 *   alive (TRUST_WINDOW_MS in api/db/announcement-line.ts), otherwise every request is answered from the database.
 *
 * One per process, made and started by the process's runtime (`runtimeOf(deps).answerCache`,
 * api/app-runtime.ts) and stopped when the runtime closes.
 */
export class AnswerCache {
  private readonly entries = new Map<string, Entry>();
  private generationCounter = 0;
  private writesInFlight = 0;
  private readonly line: AnnouncementLine;
  /** Counters for the tests and the benchmark. */
  readonly stats = { hits: 0, misses: 0, stored: 0, emptied: 0 };

  constructor(sql: Sql) {
    // Any announced change, and a (re)connection (what was announced meanwhile is unknown), empties it.
    this.line = new AnnouncementLine(sql, DATA_CHANGES_CHANNEL, { changed: () => this.empty(), reconnected: () => this.empty() });
  }

  start(): void {
    this.line.start();
  }

  stop(): void {
    this.line.stop();
    this.entries.clear();
  }

  /** Whether answers may be served from memory now (the announcement line is proven alive). */
  get trusted(): boolean {
    return this.line.trusted;
  }

  get size(): number {
    return this.entries.size;
  }

  /** Forgets every answer: something they may depend on changed. */
  empty(): void {
    this.generationCounter += 1;
    if (this.entries.size > 0) this.stats.emptied += 1;
    this.entries.clear();
  }

  /**
   * Middleware for the whole API router, before anything else: a write empties the cache when it
   * starts and when it ends, and holds storing off while it runs.
   */
  trackWrites(): RequestHandler {
    return (req, res, next) => {
      if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
      this.writesInFlight += 1;
      this.empty();
      res.once('close', () => {
        this.writesInFlight -= 1;
        this.empty();
      });
      next();
    };
  }

  /**
   * Middleware for one endpoint, after its access check: answers from memory when it can;
   * otherwise lets the handler run and keeps what it sends with `res.json` and status 200.
   */
  serve(): RequestHandler {
    return (req, res, next) => {
      const user = res.locals['user'] as User | undefined;
      const key = `${user?.role ?? 'public'} ${req.originalUrl}`;
      const entry = this.lookup(key);
      if (entry) {
        this.stats.hits += 1;
        sendKeptAnswer(req, res, entry);
        return;
      }
      this.stats.misses += 1;
      const generation = this.generationCounter;
      const json = res.json.bind(res);
      res.json = (body: unknown) => {
        if (res.statusCode !== 200) return json(body);
        const fresh: Entry = { json: Buffer.from(JSON.stringify(body) ?? 'null'), storedAtMs: Date.now() };
        this.store(key, fresh, generation);
        sendKeptAnswer(req, res, fresh);
        return res;
      };
      next();
    };
  }

  private lookup(key: string): Entry | undefined {
    const entry = this.entries.get(key);
    if (!entry) return undefined;
    if (!this.trusted || Date.now() - entry.storedAtMs > ENTRY_TTL_MS) {
      this.entries.delete(key);
      return undefined;
    }
    return entry;
  }

  private store(key: string, entry: Entry, generationAtRead: number): void {
    if (!this.trusted || this.writesInFlight > 0 || generationAtRead !== this.generationCounter) return;
    if (this.entries.size >= MAX_ENTRIES) this.entries.delete(this.entries.keys().next().value!);
    this.entries.set(key, entry);
    this.stats.stored += 1;
  }
}

/**
 * Sends a kept answer with status 200, compressed as the client accepts (each encoding made once,
 * when first asked for, and kept with it). The API's compression middleware leaves it alone: it
 * carries its Content-Encoding already. A large answer's brotli copy is then replaced by a
 * best-quality one made in the background (`BEST_BROTLI_FROM_BYTES`); `grew` hears of it with the
 * entry's size before, for a store that counts its bytes.
 */
export function sendKeptAnswer(req: Request, res: Response, entry: KeptAnswer, grew?: (before: number) => void): void {
  let body = entry.json;
  let encoding: 'br' | 'gzip' | undefined;
  if (entry.json.length >= COMPRESS_FROM_BYTES) {
    // Browsers send `gzip, deflate, br, zstd` without weights: among encodings rated alike brotli
    // wins (as in the compression middleware), not the first the client lists.
    const accepted = new Negotiator(req).encoding(['br', 'gzip', 'identity'], { preferred: ['br', 'gzip'] });
    if (accepted === 'br') {
      if (!entry.br) {
        entry.br = brotliCompressSync(entry.json, {
          params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 5, [zlibConstants.BROTLI_PARAM_SIZE_HINT]: entry.json.length },
        });
        if (entry.json.length >= BEST_BROTLI_FROM_BYTES) makeBestBrotli(entry, grew);
      }
      body = entry.br;
      encoding = 'br';
    } else if (accepted === 'gzip') {
      entry.gzip ??= gzipSync(entry.json, { level: 6 });
      body = entry.gzip;
      encoding = 'gzip';
    }
    res.vary('Accept-Encoding');
  }
  res.status(200);
  res.setHeader('Content-Type', 'application/json; charset=utf-8');
  if (encoding) res.setHeader('Content-Encoding', encoding);
  res.setHeader('Content-Length', body.length);
  res.end(body);
}

/** Replaces `entry.br` with a best-quality copy made off the event loop, unless enough are under way. */
function makeBestBrotli(entry: KeptAnswer, grew: ((before: number) => void) | undefined): void {
  if (bestBrotliUnderWay >= BEST_BROTLI_AT_ONCE) return;
  bestBrotliUnderWay += 1;
  brotliCompress(
    entry.json,
    {
      params: {
        [zlibConstants.BROTLI_PARAM_QUALITY]: zlibConstants.BROTLI_MAX_QUALITY,
        [zlibConstants.BROTLI_PARAM_SIZE_HINT]: entry.json.length,
      },
    },
    (error, best) => {
      bestBrotliUnderWay -= 1;
      if (error || !entry.br || best.length >= entry.br.length) return;
      const before = sizeOf(entry);
      entry.br = best;
      grew?.(before);
    },
  );
}
