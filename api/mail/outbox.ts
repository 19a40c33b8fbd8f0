import { and, desc, eq, lte, sql } from 'drizzle-orm';
import type { Database, Executor } from '../db/client';
import { capturedMail, mailOutbox, type OutboxRow } from '../db/schema/index';

export interface MailMessage {
  to: string;
  subject: string;
  textBody: string;
}

/**
 * Queues a message. Call it with the transaction that makes the change the message announces,
 * so the message exists exactly when the change does.
 */
export async function enqueueMail(db: Executor, message: MailMessage): Promise<void> {
  await db.insert(mailOutbox).values({ toAddress: message.to, subject: message.subject, textBody: message.textBody });
}

/**
 * Claims up to `limit` due messages for this worker. `FOR UPDATE SKIP LOCKED` lets several
 * worker processes share the outbox without sending a message twice; the claim pushes the next
 * attempt into the future, so a worker that dies mid-send leaves the message to be retried.
 */
export async function claimDueMail(db: Database, limit: number, leaseS: number): Promise<OutboxRow[]> {
  return db.transaction(async (tx) => {
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
      .set({ nextAttemptAt: sql`now() + make_interval(secs => ${leaseS})`, attempts: sql`${mailOutbox.attempts} + 1` })
      .where(sql`${mailOutbox.id} in ${due.map((row) => row.id)}`);
    return due;
  });
}

export async function markSent(db: Executor, id: string) {
  await db.update(mailOutbox).set({ status: 'sent', sentAt: new Date(), lastError: null }).where(eq(mailOutbox.id, id));
}

export async function markAttemptFailed(db: Executor, id: string, error: string, retryAt: Date | null) {
  await db
    .update(mailOutbox)
    .set(retryAt ? { lastError: error, nextAttemptAt: retryAt } : { lastError: error, status: 'failed' })
    .where(eq(mailOutbox.id, id));
}

export function listOutbox(db: Executor, limit = 500) {
  return db.select().from(mailOutbox).orderBy(desc(mailOutbox.createdAt)).limit(limit);
}

export function listCapturedMail(db: Executor, limit = 500) {
  return db.select().from(capturedMail).orderBy(desc(capturedMail.receivedAt)).limit(limit);
}
