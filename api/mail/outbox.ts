import { randomUUID } from 'node:crypto';
import { and, desc, eq, inArray, lte, sql } from 'drizzle-orm';
import type { Database, Executor } from '../db/client';
import { capturedMail, mailOutbox, type OutboxRow } from '../db/schema/index';
import { MAIL_LINK_PLACEHOLDER } from './sealed-link';

export interface MailMessage {
  to: string;
  subject: string;
  /** The text; a credential link goes in as MAIL_LINK_PLACEHOLDER with the link sealed beside it. */
  textBody: string;
  /** The sealed link (sealLink) that replaces the placeholder when the message is sent. */
  sealedLink?: string;
}

/**
 * Queues a message. Call it with the transaction that makes the change the message announces,
 * so the message exists exactly when the change does.
 */
export async function enqueueMail(db: Executor, message: MailMessage): Promise<void> {
  if (message.sealedLink && !message.textBody.includes(MAIL_LINK_PLACEHOLDER)) {
    throw new Error('A message with a sealed link needs MAIL_LINK_PLACEHOLDER in its text');
  }
  await db.insert(mailOutbox).values({
    toAddress: message.to,
    subject: message.subject,
    textBody: message.textBody,
    sealedLink: message.sealedLink ?? null,
  });
}

/** Messages claimed by one worker, and the token that proves the claim. */
export interface MailClaim {
  token: string;
  messages: OutboxRow[];
}

/**
 * Claims up to `limit` due messages for this worker. `FOR UPDATE SKIP LOCKED` lets several
 * worker processes share the outbox; the claim pushes the next attempt `claimS` into the future
 * and stamps a claim token, so a worker that dies mid-send leaves the message to be retried once
 * the claim runs out, and a worker whose claim ran out cannot record an outcome over another's.
 */
export async function claimDueMail(db: Database, limit: number, claimS: number): Promise<MailClaim> {
  const token = randomUUID();
  const messages = await db.transaction(async (tx) => {
    const due = await tx
      .select()
      .from(mailOutbox)
      .where(and(eq(mailOutbox.status, 'queued'), lte(mailOutbox.nextAttemptAt, new Date())))
      .orderBy(mailOutbox.createdAt)
      .limit(limit)
      .for('update', { skipLocked: true });
    if (due.length === 0) return [];
    await tx
      .update(mailOutbox)
      .set({ nextAttemptAt: sql`now() + make_interval(secs => ${claimS})`, claimToken: token })
      .where(
        inArray(
          mailOutbox.id,
          due.map((row) => row.id),
        ),
      );
    return due;
  });
  return { token, messages };
}

/**
 * Extends the claim on one message before and while it is sent (and counts the attempt); false
 * when the claim was lost (it ran out and another worker took the message).
 */
export async function extendClaim(db: Executor, id: string, token: string, claimS: number, countAttempt = false): Promise<boolean> {
  const extended = await db
    .update(mailOutbox)
    .set({
      nextAttemptAt: sql`now() + make_interval(secs => ${claimS})`,
      ...(countAttempt ? { attempts: sql`${mailOutbox.attempts} + 1` } : {}),
    })
    .where(and(eq(mailOutbox.id, id), eq(mailOutbox.claimToken, token), eq(mailOutbox.status, 'queued')))
    .returning({ id: mailOutbox.id });
  return extended.length === 1;
}

/** Records the send; the sealed link goes with the claim. */
export async function markSent(db: Executor, id: string, token: string) {
  await db
    .update(mailOutbox)
    .set({ status: 'sent', sentAt: new Date(), lastError: null, sealedLink: null, claimToken: null })
    .where(and(eq(mailOutbox.id, id), eq(mailOutbox.claimToken, token)));
}

export async function markAttemptFailed(db: Executor, id: string, token: string, error: string, retryAt: Date | null) {
  await db
    .update(mailOutbox)
    .set(
      retryAt
        ? { lastError: error, nextAttemptAt: retryAt, claimToken: null }
        : { lastError: error, status: 'failed', sealedLink: null, claimToken: null },
    )
    .where(and(eq(mailOutbox.id, id), eq(mailOutbox.claimToken, token)));
}

export function listOutbox(db: Executor, limit = 500) {
  return db.select().from(mailOutbox).orderBy(desc(mailOutbox.createdAt)).limit(limit);
}

export function listCapturedMail(db: Executor, limit = 500) {
  return db.select().from(capturedMail).orderBy(desc(capturedMail.receivedAt)).limit(limit);
}
