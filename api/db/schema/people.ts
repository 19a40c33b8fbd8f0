import { index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { ROLES } from '@shared/domain/roles';
import { PERSON_STATUSES } from '@shared/domain/people';
import { timestamps } from './columns';

export const roleEnum = pgEnum('role', ROLES);
export const personStatusEnum = pgEnum('person_status', PERSON_STATUSES);

export const users = pgTable(
  'users',
  {
    id: uuid().primaryKey().defaultRandom(),
    email: text().notNull(),
    name: text().notNull(),
    role: roleEnum().notNull(),
    status: personStatusEnum().notNull().default('invited'),
    /** argon2id hash; null until the invitation is accepted. */
    passwordHash: text(),
    passwordChangedAt: timestamp({ withTimezone: true }),
    lastSignInAt: timestamp({ withTimezone: true }),
    /** Which e-mail notifications the person wants (keys documented in shared/domain). */
    notificationSettings: jsonb().$type<Record<string, boolean>>().notNull().default({}),
    ...timestamps,
  },
  // E-mails are stored lower-cased (the shared email schema lower-cases them).
  (table) => [uniqueIndex('users_email_key').on(table.email)],
);
export type UserRow = typeof users.$inferSelect;

/** One row per signed-in session; the JWT carries its id, so revoking the row ends the session. */
export const sessions = pgTable(
  'sessions',
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    revokedAt: timestamp({ withTimezone: true }),
    userAgent: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('sessions_user_id_idx').on(table.userId)],
);

export const accountTokenKindEnum = pgEnum('account_token_kind', ['invite', 'reset']);

/** Single-use, expiring tokens sent by e-mail; only their SHA-256 is stored. */
export const accountTokens = pgTable(
  'account_tokens',
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: accountTokenKindEnum().notNull(),
    tokenHash: text().notNull(),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    usedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [uniqueIndex('account_tokens_token_hash_key').on(table.tokenHash)],
);

/**
 * Attempt counters for sign-in and password-reset requests, one row per key ("account:<e-mail>",
 * "device:<id>", "address:<ip>", "reset:<e-mail>", "reset-address:<ip>"), shared by every API
 * process. An attempt is counted (under a row lock) before the password is checked, so
 * simultaneous guesses cannot all pass; past the free attempts each one must wait longer
 * (api/auth/attempt-throttle.ts).
 */
export const attemptThrottles = pgTable(
  'attempt_throttles',
  {
    key: text().primaryKey(),
    /** The account the key belongs to (account, device and reset keys), for the administrator's view. */
    email: text(),
    attempts: integer().notNull().default(0),
    lastAttemptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    /** No attempt on this key is taken before this time. */
    blockedUntil: timestamp({ withTimezone: true }),
  },
  (table) => [index('attempt_throttles_email_idx').on(table.email), index('attempt_throttles_last_attempt_idx').on(table.lastAttemptAt)],
);
export type AttemptThrottleRow = typeof attemptThrottles.$inferSelect;
