import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Executor } from '../db/client';
import { accountTokens, sessions, users } from '../db/schema/index';

export function findUserByEmail(db: Executor, email: string) {
  return db.query.users.findFirst({ where: eq(users.email, email.toLowerCase()) });
}

export function findUserById(db: Executor, userId: string) {
  return db.query.users.findFirst({ where: eq(users.id, userId) });
}

/** The session's person when the session is live and the account active. */
export async function findLiveSessionUser(db: Executor, sessionId: string, userId: string) {
  const [row] = await db
    .select({ user: users, session: sessions })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(
      and(
        eq(sessions.id, sessionId),
        eq(sessions.userId, userId),
        isNull(sessions.revokedAt),
        gt(sessions.expiresAt, new Date()),
        eq(users.status, 'active'),
      ),
    );
  return row;
}

export async function createSession(db: Executor, userId: string, expiresAt: Date, userAgent: string | undefined) {
  const [session] = await db.insert(sessions).values({ userId, expiresAt, userAgent }).returning();
  return session!;
}

export async function extendSession(db: Executor, sessionId: string, expiresAt: Date) {
  await db.update(sessions).set({ expiresAt }).where(eq(sessions.id, sessionId));
}

export async function revokeSession(db: Executor, sessionId: string) {
  await db.update(sessions).set({ revokedAt: new Date() }).where(eq(sessions.id, sessionId));
}

export async function revokeAllSessions(db: Executor, userId: string) {
  await db
    .update(sessions)
    .set({ revokedAt: new Date() })
    .where(and(eq(sessions.userId, userId), isNull(sessions.revokedAt)));
}

export async function insertAccountToken(
  db: Executor,
  token: { userId: string; kind: 'invite' | 'reset'; tokenHash: string; expiresAt: Date },
) {
  // A new token of a kind replaces any unused one, so only the latest e-mail's link works.
  await db
    .update(accountTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(accountTokens.userId, token.userId), eq(accountTokens.kind, token.kind), isNull(accountTokens.usedAt)));
  await db.insert(accountTokens).values(token);
}

export function findAccountToken(db: Executor, tokenHash: string) {
  return db.query.accountTokens.findFirst({ where: eq(accountTokens.tokenHash, tokenHash) });
}

/** Marks the token used; false when another request used it first. */
export async function consumeAccountToken(db: Executor, tokenId: string): Promise<boolean> {
  const used = await db
    .update(accountTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(accountTokens.id, tokenId), isNull(accountTokens.usedAt)))
    .returning({ id: accountTokens.id });
  return used.length === 1;
}

export async function setPassword(db: Executor, userId: string, passwordHash: string) {
  await db.update(users).set({ passwordHash, passwordChangedAt: new Date(), status: 'active' }).where(eq(users.id, userId));
}

export async function touchLastSignIn(db: Executor, userId: string) {
  await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, userId));
}
