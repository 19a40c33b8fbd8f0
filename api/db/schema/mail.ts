import { index, integer, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { OUTBOX_STATUSES } from '@shared/domain/mail';

export const outboxStatusEnum = pgEnum('outbox_status', OUTBOX_STATUSES);

/**
 * Transactional outbox: a message is inserted in the same transaction as the change that causes
 * it and sent later by the mail worker, so no message is lost while SMTP is down.
 */
export const mailOutbox = pgTable(
  'mail_outbox',
  {
    id: uuid().primaryKey().defaultRandom(),
    toAddress: text().notNull(),
    subject: text().notNull(),
    /** The message; a credential link in it is stored as MAIL_LINK_PLACEHOLDER (api/mail/sealed-link.ts). */
    textBody: text().notNull(),
    /** The link that replaces the placeholder when sending, sealed; cleared once the message is sent. */
    sealedLink: text(),
    status: outboxStatusEnum().notNull().default('queued'),
    attempts: integer().notNull().default(0),
    lastError: text(),
    nextAttemptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    /** The worker's claim on a message being sent: only its holder may extend it or record the outcome. */
    claimToken: uuid(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp({ withTimezone: true }),
  },
  (table) => [index('mail_outbox_due_idx').on(table.status, table.nextAttemptAt)],
);
export type OutboxRow = typeof mailOutbox.$inferSelect;

/** What the local SMTP fake received (development and tests only). */
export const capturedMail = pgTable('captured_mail', {
  id: uuid().primaryKey().defaultRandom(),
  fromAddress: text().notNull(),
  toAddress: text().notNull(),
  subject: text().notNull(),
  textBody: text().notNull(),
  receivedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});
