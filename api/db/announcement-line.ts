import { randomUUID } from 'node:crypto';
import type { Sql } from 'postgres';

/** How often each process checks its own announcement line, ms. */
export const HEARTBEAT_MS = 1_000;
/**
 * A line is trusted only while this process heard its own heartbeat sent within this window, ms:
 * PostgreSQL delivers notifications to a listener in commit order, so hearing a heartbeat sent at
 * T proves that every change committed before T has been heard too. A lost or stuck listening
 * connection therefore stops being trusted after at most this long, until the line is back.
 */
export const TRUST_WINDOW_MS = 3 * HEARTBEAT_MS;

export interface AnnouncementHandlers {
  /** A change was announced (any payload that is not a heartbeat). */
  changed(payload: string): void;
  /** The listening connection was (re)made: whatever was announced while it was down is unknown. */
  reconnected(): void;
}

/**
 * One PostgreSQL LISTEN channel on which the database announces changes at commit, and the proof
 * that this process still hears it: every HEARTBEAT_MS the process sends `p:<process>:<sequence>`
 * on the same channel and notes when it hears its own. The in-process caches built on it (the
 * session cache, the answer cache) answer from memory only while `trusted`; otherwise their
 * callers go to the database.
 */
export class AnnouncementLine {
  private readonly processTag = randomUUID().slice(0, 8);
  private sequence = 0;
  private readonly sentAtMs = new Map<number, number>();
  /** When the newest heartbeat this process heard had been sent (its own clock), ms. */
  private confirmedUpToMs = -Infinity;
  private listening: Promise<void> | null = null;
  private unlisten: (() => Promise<void>) | null = null;
  private timer: NodeJS.Timeout | null = null;
  private stopped = false;

  constructor(
    private readonly sql: Sql,
    private readonly channel: string,
    private readonly handlers: AnnouncementHandlers,
  ) {}

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
    void this.unlisten?.().catch(() => undefined);
  }

  get isStopped(): boolean {
    return this.stopped;
  }

  /** Whether the line is proven alive right now (see TRUST_WINDOW_MS). */
  get trusted(): boolean {
    return !this.stopped && Date.now() - this.confirmedUpToMs <= TRUST_WINDOW_MS;
  }

  private listen(): void {
    if (this.listening || this.stopped) return;
    this.listening = this.sql
      .listen(
        this.channel,
        (payload) => this.heard(payload),
        () => this.handlers.reconnected(),
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
    const [kind, tag, sequence] = payload.split(':');
    if (kind !== 'p') {
      this.handlers.changed(payload);
      return;
    }
    if (tag !== this.processTag) return;
    const sentAtMs = this.sentAtMs.get(Number(sequence));
    if (sentAtMs !== undefined) this.confirmedUpToMs = Math.max(this.confirmedUpToMs, sentAtMs);
    for (const key of this.sentAtMs.keys()) if (key <= Number(sequence)) this.sentAtMs.delete(key);
  }

  private beat(): void {
    if (this.stopped) return;
    // A heartbeat long unheard: the driver may have given up re-listening after an outage, so
    // listen again (the line stays untrusted meanwhile).
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
    this.sql.notify(this.channel, `p:${this.processTag}:${sequence}`).catch((error: unknown) => {
      // The pool was closed (the app is shutting down or a test ended): stop beating.
      if ((error as { code?: string }).code === 'CONNECTION_ENDED') this.stop();
    });
  }
}
