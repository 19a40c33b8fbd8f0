import type { Sql } from 'postgres';
import type { Role } from '@shared/domain/roles';
import { AnnouncementLine } from '../db/announcement-line';

/**
 * PostgreSQL channel on which the database announces every change to a session or an account
 * (triggers on `sessions` and `users`, migration 0014): `s:<session id>` or `u:<user id>`.
 * Heartbeats of the processes use it too (`p:<process>:<sequence>`).
 */
export const SESSION_CHANGES_CHANNEL = 'descentry_session_changes';

/** The longest a looked-up session is answered from memory, ms, even when nothing announced a change. */
const ENTRY_TTL_MS = 60_000;
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
 * line is proven alive (TRUST_WINDOW_MS in api/db/announcement-line.ts); otherwise the caller asks the database.
 *
 * One per process, made and started by the process's runtime (`runtimeOf(deps).sessionCache`,
 * api/app-runtime.ts) and stopped when the runtime closes.
 */
export class SessionCache {
  private readonly entries = new Map<string, Entry>();
  /** Bumped by every forget: a lookup that started before a change must not be stored after it. */
  private generationCounter = 0;
  private readonly line: AnnouncementLine;
  /** Counters for the tests and the benchmark. */
  readonly stats = { hits: 0, misses: 0, forgotten: 0 };

  constructor(sql: Sql) {
    this.line = new AnnouncementLine(sql, SESSION_CHANGES_CHANNEL, {
      changed: (payload) => this.heard(payload),
      reconnected: () => this.forgetAll(),
    });
  }

  /** Starts listening and the heartbeat; safe to call more than once. */
  start(): void {
    this.line.start();
  }

  stop(): void {
    this.line.stop();
    this.entries.clear();
  }

  /**
   * Whether cached answers may be used right now: the announcement line is proven alive, so a
   * lost or stuck listening connection switches the cache off and every request goes to the
   * database again until the line is back (api/db/announcement-line.ts).
   */
  get trusted(): boolean {
    return this.line.trusted;
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

  private heard(payload: string): void {
    const [kind, id] = payload.split(':');
    if (kind === 's' && id) this.forgetSession(id);
    else if (kind === 'u' && id) this.forgetUser(id);
    else this.forgetAll();
  }
}
