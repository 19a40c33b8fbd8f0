import type { User } from '@shared/domain/auth';
import type { AppDeps } from '../app-deps';
import type { Executor } from '../db/client';
import { HttpError, UnauthorizedError } from '../http/http-error';
import { enqueueMail } from '../mail/outbox';
import { RESET_TTL_MINUTES, hashAccountToken, newAccountToken } from './account-tokens';
import * as repository from './auth-repository';
import { dummyPasswordHash, hashPassword, verifyPassword } from './passwords';

/** Failed sign-ins allowed per account and per address within the window (OWASP: throttle). */
export const LOGIN_WINDOW_MS = 15 * 60_000;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_IP = 30;

export class TooManyAttemptsError extends HttpError {
  constructor(retryAfterS: number) {
    super(
      429,
      'too_many_attempts',
      `Too many failed sign-ins. Try again in ${Math.ceil(retryAfterS / 60)} minute(s).`,
      { retryAfterS },
      { 'Retry-After': String(retryAfterS) },
    );
  }
}

async function assertNotThrottled(db: Executor, email: string, ip: string) {
  const since = new Date(Date.now() - LOGIN_WINDOW_MS);
  const byAccount = await repository.countRecentFailures(db, since, { email });
  const byIp = await repository.countRecentFailures(db, since, { ip });
  const blocked = [
    byAccount.failures >= MAX_FAILURES_PER_ACCOUNT ? byAccount.oldest : null,
    byIp.failures >= MAX_FAILURES_PER_IP ? byIp.oldest : null,
  ].filter((oldest): oldest is Date => oldest !== null);
  if (blocked.length > 0) {
    const until = Math.max(...blocked.map((oldest) => oldest.getTime() + LOGIN_WINDOW_MS));
    throw new TooManyAttemptsError(Math.max(1, Math.ceil((until - Date.now()) / 1000)));
  }
}

/** Checks the credentials and opens a session; the same 401 for unknown e-mail and wrong password. */
export async function signIn(
  { db, config }: AppDeps,
  credentials: { email: string; password: string },
  client: { ip: string; userAgent: string | undefined },
) {
  await assertNotThrottled(db, credentials.email, client.ip);
  const user = await repository.findUserByEmail(db, credentials.email);
  const passwordHash = user?.passwordHash ?? (await dummyPasswordHash());
  const matches = await verifyPassword(passwordHash, credentials.password);
  if (!user || !user.passwordHash || !matches || user.status !== 'active') {
    await repository.recordLoginFailure(db, credentials.email, client.ip);
    throw new UnauthorizedError('E-mail or password is wrong, or the account is disabled', 'invalid_credentials');
  }
  await repository.clearLoginFailures(db, credentials.email);
  await repository.touchLastSignIn(db, user.id);
  const expiresAt = new Date(Date.now() + config.SESSION_TTL_MINUTES * 60_000);
  const session = await repository.createSession(db, user.id, expiresAt, client.userAgent);
  return { session, user: toUser(user) };
}

export async function changePassword(
  { db }: AppDeps,
  userId: string,
  change: { currentPassword: string; newPassword: string },
) {
  const user = await repository.findUserById(db, userId);
  if (!user?.passwordHash || !(await verifyPassword(user.passwordHash, change.currentPassword))) {
    throw new HttpError(400, 'wrong_password', 'The current password is wrong');
  }
  const passwordHash = await hashPassword(change.newPassword);
  await db.transaction(async (tx) => {
    await repository.setPassword(tx, userId, passwordHash);
    // A changed password ends every session, this one included.
    await repository.revokeAllSessions(tx, userId);
  });
}

/** Looks a token up without using it, so the page can greet the person. */
export async function describeToken({ db }: AppDeps, token: string) {
  const row = await repository.findAccountToken(db, hashAccountToken(token));
  if (!row) throw new HttpError(404, 'unknown_token', 'This link is not valid. Ask for a new one.');
  if (row.usedAt) throw new HttpError(410, 'used_token', 'This link has already been used. Ask for a new one.');
  if (row.expiresAt < new Date()) throw new HttpError(410, 'expired_token', 'This link has expired. Ask for a new one.');
  const user = await repository.findUserById(db, row.userId);
  if (!user || user.status === 'disabled') {
    throw new HttpError(410, 'account_disabled', 'This account is disabled.');
  }
  return { row, user };
}

/** Sets the password through an invitation or reset link; the link works once. */
export async function setPasswordWithToken(
  deps: AppDeps,
  kind: 'invite' | 'reset',
  request: { token: string; password: string },
) {
  const { row, user } = await describeToken(deps, request.token);
  if (row.kind !== kind) throw new HttpError(404, 'unknown_token', 'This link is not valid. Ask for a new one.');
  const passwordHash = await hashPassword(request.password);
  await deps.db.transaction(async (tx) => {
    if (!(await repository.consumeAccountToken(tx, row.id))) {
      throw new HttpError(410, 'used_token', 'This link has already been used. Ask for a new one.');
    }
    await repository.setPassword(tx, user.id, passwordHash);
    await repository.revokeAllSessions(tx, user.id);
  });
}

/**
 * Queues a reset e-mail when the address belongs to an active account. Answers the same either
 * way, so the form does not reveal who has an account.
 */
export async function requestPasswordReset({ db, config }: AppDeps, email: string) {
  const user = await repository.findUserByEmail(db, email);
  if (!user || user.status !== 'active') return;
  await queuePasswordResetMail(db, config.PUBLIC_URL, user);
}

export async function queuePasswordResetMail(
  db: Executor,
  publicUrl: string,
  user: { id: string; email: string; name: string },
) {
  const { token, tokenHash } = newAccountToken();
  const link = new URL(`/reset-password?token=${token}`, publicUrl).toString();
  await db.transaction(async (tx) => {
    await repository.insertAccountToken(tx, {
      userId: user.id,
      kind: 'reset',
      tokenHash,
      expiresAt: new Date(Date.now() + RESET_TTL_MINUTES * 60_000),
    });
    await enqueueMail(tx, {
      to: user.email,
      subject: 'Reset your Descentry password',
      textBody: [
        `Hello ${user.name},`,
        '',
        'Someone asked to reset the password of your Descentry account. To choose a new password, open:',
        link,
        '',
        `The link works once and expires in ${RESET_TTL_MINUTES} minutes. If you did not ask for it, ignore this message.`,
      ].join('\n'),
    });
  });
}

export function toUser(row: { id: string; email: string; name: string; role: User['role'] }): User {
  return { id: row.id, email: row.email, name: row.name, role: row.role };
}
