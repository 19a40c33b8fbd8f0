/**
 * Throttling of sign-in and password-reset attempts, after the OWASP Authentication Cheat Sheet
 * ("Login Throttling", "Account Lockout") and its "Slow Down Online Guessing Attacks with Device
 * Cookies" note:
 *
 * - every attempt is counted per key before the password is checked, under a row lock, so twenty
 *   simultaneous guesses get twenty different counts and only the free ones are checked;
 * - past the free attempts the key is slowed down, not locked: each further attempt waits twice
 *   as long as the one before (from `firstDelayS` up to `maxDelayS`), and the count starts over
 *   after `quietMs` without attempts;
 * - an account is counted per browser that has signed in to it before (a device cookie) and
 *   separately for every other client, so guesses from elsewhere slow the others down but never
 *   lock the owner out of their usual browser; an administrator can see and lift the slow-down.
 *
 * The counters live in PostgreSQL (`attempt_throttles`), shared by every API process.
 */
import { and, eq, gt, inArray, lt, sql } from 'drizzle-orm';
import type { Database, Executor } from '../db/client';
import { attemptThrottles, type AttemptThrottleRow } from '../db/schema/index';
import { HttpError } from '../http/http-error';

export interface ThrottlePolicy {
  /** Attempts taken without waiting. */
  freeAttempts: number;
  /** Wait after the last free attempt, s; it doubles with every further attempt. */
  firstDelayS: number;
  /** Longest wait, s. */
  maxDelayS: number;
  /** Without an attempt for this long the count starts over, ms. */
  quietMs: number;
}

/** Per account (or per device cookie): five guesses, then 30 s, 1 min, 2 min … up to 15 min. */
export const ACCOUNT_SIGN_IN_POLICY: ThrottlePolicy = { freeAttempts: 5, firstDelayS: 30, maxDelayS: 15 * 60, quietMs: 15 * 60_000 };
/** Per address: thirty guesses across any accounts, then the same doubling waits. */
export const ADDRESS_SIGN_IN_POLICY: ThrottlePolicy = { freeAttempts: 30, firstDelayS: 30, maxDelayS: 15 * 60, quietMs: 15 * 60_000 };
/** Reset e-mails per account: three, then 5 min, 10 min … up to an hour between them. */
export const ACCOUNT_RESET_POLICY: ThrottlePolicy = { freeAttempts: 3, firstDelayS: 5 * 60, maxDelayS: 60 * 60, quietMs: 60 * 60_000 };
/** Reset requests per address, whatever the accounts. */
export const ADDRESS_RESET_POLICY: ThrottlePolicy = { freeAttempts: 20, firstDelayS: 5 * 60, maxDelayS: 60 * 60, quietMs: 60 * 60_000 };

export interface ThrottleKey {
  key: string;
  policy: ThrottlePolicy;
  /** The account the key belongs to, if any (shown to administrators, cleared by them). */
  email?: string;
}

/** 429 with Retry-After; the message says how long to wait, in the words of `what`. */
export class TooManyAttemptsError extends HttpError {
  constructor(retryAfterS: number, code = 'too_many_attempts', what = 'Too many failed sign-ins') {
    const wait = retryAfterS < 90 ? `${retryAfterS} seconds` : `${Math.ceil(retryAfterS / 60)} minutes`;
    super(429, code, `${what}. Try again in ${wait}.`, { retryAfterS }, { 'Retry-After': String(retryAfterS) });
  }
}

/** Wait after the `attempts`-th attempt, s (0 while attempts remain free). */
export function delayAfterS(attempts: number, policy: ThrottlePolicy): number {
  if (attempts < policy.freeAttempts) return 0;
  return Math.min(policy.maxDelayS, policy.firstDelayS * 2 ** (attempts - policy.freeAttempts));
}

/**
 * Counts one attempt on every key, atomically: either every key takes it, or none does and the
 * answer is the longest wait among the blocked keys (thrown as `TooManyAttemptsError`).
 */
export async function takeAttempt(db: Database, keys: ThrottleKey[], refusal: (retryAfterS: number) => HttpError): Promise<void> {
  const now = new Date();
  const ordered = [...keys].sort((a, b) => a.key.localeCompare(b.key));
  const waitS = await db.transaction(async (tx) => {
    // Rows are locked in key order, so two requests sharing keys cannot deadlock.
    await tx
      .insert(attemptThrottles)
      .values(ordered.map(({ key, email }) => ({ key, email: email ?? null, attempts: 0, lastAttemptAt: now })))
      .onConflictDoNothing();
    const rows = await tx
      .select()
      .from(attemptThrottles)
      .where(
        inArray(
          attemptThrottles.key,
          ordered.map(({ key }) => key),
        ),
      )
      .orderBy(attemptThrottles.key)
      .for('update');
    const current = ordered.map(({ key, policy }) => {
      const row = rows.find((candidate) => candidate.key === key)!;
      const quiet = now.getTime() - row.lastAttemptAt.getTime() > policy.quietMs;
      const blocked = row.blockedUntil !== null && row.blockedUntil > now;
      return { key, policy, attempts: quiet && !blocked ? 0 : row.attempts, blockedUntil: blocked ? row.blockedUntil : null };
    });
    const longest = Math.max(
      0,
      ...current.map((entry) => (entry.blockedUntil ? Math.ceil((entry.blockedUntil.getTime() - now.getTime()) / 1000) : 0)),
    );
    if (longest > 0) return longest;
    for (const entry of current) {
      const attempts = entry.attempts + 1;
      const delayS = delayAfterS(attempts, entry.policy);
      await tx
        .update(attemptThrottles)
        .set({ attempts, lastAttemptAt: now, blockedUntil: delayS > 0 ? new Date(now.getTime() + delayS * 1000) : null })
        .where(eq(attemptThrottles.key, entry.key));
    }
    return 0;
  });
  if (waitS > 0) throw refusal(waitS);
}

/** The attempt on `key` succeeded: its count starts over (a signed-in account, a used device). */
export async function clearKey(db: Executor, key: string): Promise<void> {
  await db.delete(attemptThrottles).where(eq(attemptThrottles.key, key));
}

/**
 * The attempt on `key` turned out not to be a guess (a right password from a shared address):
 * it is handed back, and the wait it started goes with it.
 */
export async function returnAttempt(db: Executor, key: string, policy: ThrottlePolicy): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(attemptThrottles).where(eq(attemptThrottles.key, key)).for('update');
    if (!row) return;
    const attempts = Math.max(0, row.attempts - 1);
    const delayS = delayAfterS(attempts, policy);
    await tx
      .update(attemptThrottles)
      .set({ attempts, blockedUntil: delayS > 0 ? new Date(row.lastAttemptAt.getTime() + delayS * 1000) : null })
      .where(eq(attemptThrottles.key, key));
  });
}

/** Every counter of an account (its own, its devices', its reset requests): an administrator lifts them. */
export async function clearAccount(db: Executor, email: string): Promise<number> {
  const removed = await db
    .delete(attemptThrottles)
    .where(eq(attemptThrottles.email, email.toLowerCase()))
    .returning({ key: attemptThrottles.key });
  return removed.length;
}

/** Sign-in counters of these accounts that are slowed down or counting failures now. */
export async function accountSignInStates(
  db: Executor,
  emails: string[],
): Promise<Map<string, { failedAttempts: number; slowedUntil: Date | null }>> {
  const states = new Map<string, { failedAttempts: number; slowedUntil: Date | null }>();
  if (emails.length === 0) return states;
  const now = new Date();
  const rows: AttemptThrottleRow[] = await db
    .select()
    .from(attemptThrottles)
    .where(
      and(
        inArray(
          attemptThrottles.key,
          emails.map((email) => accountKey(email)),
        ),
        gt(attemptThrottles.lastAttemptAt, new Date(now.getTime() - ACCOUNT_SIGN_IN_POLICY.quietMs)),
      ),
    );
  for (const row of rows) {
    if (!row.email) continue;
    states.set(row.email, {
      failedAttempts: row.attempts,
      slowedUntil: row.blockedUntil && row.blockedUntil > now ? row.blockedUntil : null,
    });
  }
  return states;
}

/** Removes counters idle for a day (they would start over anyway). */
export async function purgeIdleThrottles(db: Executor): Promise<void> {
  await db
    .delete(attemptThrottles)
    .where(
      and(
        lt(attemptThrottles.lastAttemptAt, sql`now() - interval '1 day'`),
        sql`coalesce(${attemptThrottles.blockedUntil}, '-infinity') < now()`,
      ),
    );
}

export function accountKey(email: string): string {
  return `account:${email.toLowerCase()}`;
}
