import { randomUUID } from 'node:crypto';
import type { Sql } from 'postgres';
import type { Role } from '@shared/domain/roles';
import type { Database } from '../db/client';

/**
 * PostgreSQL channel on which the database announces every change to a session or an account
 * (triggers on `sessions` and `users`, migration 0014): `s:<session id>` or `u:<user id>`.
 * Heartbeats of the processes use it too (`p:<process>:<sequence>`).
 */
export const SESSION_CHANGES_CHANNEL = 'descentry_session_changes';

/** The longest a looked-up session is answered from memory, ms, even when nothing announced a change. */
const ENTRY_TTL_MS = 60_000;
/** How often each process checks its own announcement line, ms. */
const HEARTBEAT_MS = 1_000;
/**
 * The cache is used only while this process heard its own heartbeat sent within this window, ms:
 * PostgreSQL delivers notifications to a listener in commit order, so hearing a heartbeat sent at
 * T proves that every change committed before T has been heard (and forgotten) too. A lost or
 * stuck listening connection therefore switches the cache off after at most this long, and every
 * request goes to the database again until the line is back.
 */
const TRUST_WINDOW_MS = 3 * HEARTBEAT_MS;
/** Entries kept at most; the oldest are dropped first. */
const MAX_ENTRIES = 10_000;

/** What the per-request check needs of a live session. */
export interface LiveSession {
  sessionId: string;
  expiresAt: Date;
  user: { id: string; email: string; name: string; role: Role };
}

interface Entry {
  session: LiveSession;
  cachedAtMs: number;
}

/**
 * A short in-process memory of live sessions, so most requests need no database round trip to
 * check their session, without weakening revocation: sign-out, a password change, a role change,
 * a disabled or deleted account change rows of `sessions` or `users`, and the database's triggers
 * announce each change on SESSION_CHANGES_CHANNEL to every API process at commit, which forgets
 * the session (or all of the account's) at once. The cache answers only while the announcement
 * line is proven alive (TRUST_WINDOW_MS); otherwise the caller asks the database.
 */
export class SessionCache {
  private readonly entries = new Map<string, Entry>();
  /** Bumped by every forget: a lookup that started before a change must not be stored after it. */
  private generationCounter = 0;
  private readonly processTag = randomUUID().slice(0, 8);
  private sequence = 0;
  private readonly sentAtMs = new Map<number, number>();
  /** When the newest heartbeat this process heard had been sent (its own clock), ms. */
  private confirmedUpToMs = -Infinity;
  private listening: Promise<void> | null = null;
  private unlisten: (() => Promise<void>) | null = null;
  private timer: NodeJS.Timeout | null = null;
  private stopped = false;
  /** Counters for the tests and the benchmark. */
  readonly stats = { hits: 0, misses: 0, forgotten: 0 };

  constructor(private readonly sql: Sql) {}

  /** Starts listening and the heartbeat; safe to call more than once. */
  start(): void {
    if (this.stopped || this.timer) return;
    this.listen();
    this.timer = setInterval(() => this.beat(), HEARTBEAT_MS);
    this.timer.unref();
    this.beat();
  }

  stop(): void {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    this.entries.clear();
    void this.unlisten?.().catch(() => undefined);
  }

  /** Whether cached answers may be used right now (the announcement line is proven alive). */
  get trusted(): boolean {
    return !this.stopped && Date.now() - this.confirmedUpToMs <= TRUST_WINDOW_MS;
  }

  get generation(): number {
    return this.generationCounter;
  }

  /** The cached live session, or undefined when it must be looked up in the database. */
  get(sessionId: string, userId: string): LiveSession | undefined {
    const entry = this.entries.get(sessionId);
    const now = Date.now();
    if (
      !entry ||
      !this.trusted ||
      entry.session.user.id !== userId ||
      now - entry.cachedAtMs > ENTRY_TTL_MS ||
      entry.session.expiresAt.getTime() <= now
    ) {
      if (entry) this.entries.delete(sessionId);
      this.stats.misses += 1;
      return undefined;
    }
    this.stats.hits += 1;
    return entry.session;
  }

  /**
   * Remembers a session read from the database, unless something was forgotten since the read
   * began (`generationAtRead`), in which case the row may already be out of date.
   */
  remember(session: LiveSession, generationAtRead: number): void {
    if (!this.trusted || generationAtRead !== this.generationCounter) return;
    if (this.entries.size >= MAX_ENTRIES) this.entries.delete(this.entries.keys().next().value!);
    this.entries.set(session.sessionId, { session, cachedAtMs: Date.now() });
  }

  forgetSession(sessionId: string): void {
    this.generationCounter += 1;
    if (this.entries.delete(sessionId)) this.stats.forgotten += 1;
  }

  forgetUser(userId: string): void {
    this.generationCounter += 1;
    for (const [sessionId, entry] of this.entries) {
      if (entry.session.user.id === userId) {
        this.entries.delete(sessionId);
        this.stats.forgotten += 1;
      }
    }
  }

  forgetAll(): void {
    this.generationCounter += 1;
    this.stats.forgotten += this.entries.size;
    this.entries.clear();
  }

  private listen(): void {
    if (this.listening || this.stopped) return;
    this.listening = this.sql
      .listen(
        SESSION_CHANGES_CHANNEL,
        (payload) => this.heard(payload),
        () => {
          // (Re)connected: whatever was announced while the line was down is unknown.
          this.forgetAll();
        },
      )
      .then(
        (handle) => {
          this.unlisten = handle.unlisten;
          if (this.stopped) void handle.unlisten().catch(() => undefined);
        },
        () => {
          this.listening = null;
        },
      );
  }

  private heard(payload: string): void {
    const [kind, id, sequence] = payload.split(':');
    if (kind === 's' && id) this.forgetSession(id);
    else if (kind === 'u' && id) this.forgetUser(id);
    else if (kind === 'p' && id === this.processTag) {
      const sentAtMs = this.sentAtMs.get(Number(sequence));
      if (sentAtMs !== undefined) this.confirmedUpToMs = Math.max(this.confirmedUpToMs, sentAtMs);
      for (const key of this.sentAtMs.keys()) if (key <= Number(sequence)) this.sentAtMs.delete(key);
    } else if (kind !== 'p') this.forgetAll();
  }

  private beat(): void {
    if (this.stopped) return;
    // A heartbeat long unheard: the driver may have given up re-listening after an outage, so
    // listen again (the cache stays off meanwhile, see `trusted`).
    if (Date.now() - this.confirmedUpToMs > 5 * TRUST_WINDOW_MS && this.listening) {
      const unlisten = this.unlisten;
      this.listening = null;
      this.unlisten = null;
      void unlisten?.().catch(() => undefined);
    }
    this.listen();
    const sequence = ++this.sequence;
    this.sentAtMs.set(sequence, Date.now());
    if (this.sentAtMs.size > 100) this.sentAtMs.delete(this.sentAtMs.keys().next().value!);
    this.sql.notify(SESSION_CHANGES_CHANNEL, `p:${this.processTag}:${sequence}`).catch((error: unknown) => {
      // The pool was closed (the app is shutting down or a test ended): stop beating.
      if ((error as { code?: string }).code === 'CONNECTION_ENDED') this.stop();
    });
  }
}

const caches = new WeakMap<Database, SessionCache>();

/** The one session cache of a database handle (each API process has one handle). */
export function sessionCacheFor(db: Database): SessionCache {
  let cache = caches.get(db);
  if (!cache) {
    cache = new SessionCache(db.$client);
    caches.set(db, cache);
    cache.start();
  }
  return cache;
}
