import type { KeptAnswer } from './answer-cache';

/** Bytes of JSON and compressed copies a process keeps at most; the least recently used go first. */
export const BUILT_ANSWERS_MAX_BYTES = 32 * 1024 * 1024;

/**
 * Answers of the reads whose validator is made from what they depend on (`answerIdentity` in an
 * endpoint definition, api/http/answer-validator.ts), kept by that validator: a visit that finds
 * its answer here costs a lookup of the identity and the sending, not reading, checking, thinning
 * and serialising a stored result again.
 *
 * Nothing here is ever invalidated, and nothing needs to be: the key is the answer's identity (the
 * rows' versions, the query, the caller's role, the code's version), so a change of anything the
 * answer shows gives a new key and the old answer is simply never asked for again; it leaves when
 * newer ones need the room. One per process (`runtimeOf(deps).builtAnswers`).
 */
export class BuiltAnswers {
  private readonly entries = new Map<string, KeptAnswer>();
  private bytes = 0;
  /** Counters for the tests and the benchmark. */
  readonly stats = { hits: 0, misses: 0, stored: 0, dropped: 0 };

  constructor(private readonly maxBytes = BUILT_ANSWERS_MAX_BYTES) {}

  get size(): number {
    return this.entries.size;
  }

  /** The answer kept under `etag`, marked as the most recently used; undefined when none is. */
  get(etag: string): KeptAnswer | undefined {
    const entry = this.entries.get(etag);
    if (!entry) {
      this.stats.misses += 1;
      return undefined;
    }
    this.stats.hits += 1;
    this.entries.delete(etag);
    this.entries.set(etag, entry);
    return entry;
  }

  /** Keeps `entry` under `etag`; an answer larger than a quarter of the room is not kept. */
  set(etag: string, entry: KeptAnswer): void {
    const size = sizeOf(entry);
    if (size > this.maxBytes / 4) return;
    const earlier = this.entries.get(etag);
    if (earlier) {
      this.bytes -= sizeOf(earlier);
      this.entries.delete(etag);
    }
    this.entries.set(etag, entry);
    this.bytes += size;
    this.stats.stored += 1;
    this.trim();
  }

  /**
   * Counts compressed copies made after the answer was kept (sendKeptAnswer adds them to the
   * entry, some later, off the event loop): `before` is the size of `changed` before, and nothing
   * is counted when the entry kept under `etag` is no longer that one.
   */
  grew(etag: string, before: number, changed: KeptAnswer): void {
    const entry = this.entries.get(etag);
    if (!entry || entry !== changed) return;
    this.bytes += sizeOf(entry) - before;
    this.trim();
  }

  clear(): void {
    this.entries.clear();
    this.bytes = 0;
  }

  private trim(): void {
    while (this.bytes > this.maxBytes && this.entries.size > 0) {
      const [oldest, entry] = this.entries.entries().next().value!;
      this.entries.delete(oldest);
      this.bytes -= sizeOf(entry);
      this.stats.dropped += 1;
    }
  }
}

/** What a kept answer occupies: its JSON and the compressed copies made so far. */
export function sizeOf(entry: KeptAnswer): number {
  return entry.json.length + (entry.gzip?.length ?? 0) + (entry.br?.length ?? 0);
}
