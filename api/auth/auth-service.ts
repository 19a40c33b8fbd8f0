import type { User } from '@shared/domain/auth';
import type { AppDeps } from '../app-deps';
import type { Executor } from '../db/client';
import { HttpError, UnauthorizedError } from '../http/http-error';
import type { Config } from '../config';
import { enqueueMail } from '../mail/outbox';
import { MAIL_LINK_PLACEHOLDER, sealLink } from '../mail/sealed-link';
import { RESET_TTL_MINUTES, hashAccountToken, newAccountToken } from './account-tokens';
import {
  ACCOUNT_RESET_POLICY,
  ACCOUNT_SIGN_IN_POLICY,
  ADDRESS_RESET_POLICY,
  ADDRESS_SIGN_IN_POLICY,
  TooManyAttemptsError,
  accountKey,
  clearKey,
  returnAttempt,
  takeAttempt,
  type ThrottleKey,
} from './attempt-throttle';
import type { KnownDevice } from './device-cookie';
import * as repository from './auth-repository';
import { dummyPasswordHash, hashPassword, verifyPassword } from './passwords';
import { runtimeOf } from '../app-runtime';

/** Who is signing in, as far as throttling is concerned. */
export interface SignInClient {
  ip: string;
  userAgent: string | undefined;
  /** The browser's device cookie, when it has signed in before. */
  device: KnownDevice | null;
}

/**
 * Checks the credentials and opens a session; the same 401 for unknown e-mail and wrong password.
 * The attempt is counted (per account or known device, and per address) before the password is
 * checked; past the free attempts the answer is 429 with Retry-After (api/auth/attempt-throttle.ts).
 */
export async function signIn({ db, config }: AppDeps, credentials: { email: string; password: string }, client: SignInClient) {
  const email = credentials.email.toLowerCase();
  const device = client.device?.email === email ? client.device : null;
  const accountSide: ThrottleKey = device
    ? { key: `device:${device.id}`, policy: ACCOUNT_SIGN_IN_POLICY, email }
    : { key: accountKey(email), policy: ACCOUNT_SIGN_IN_POLICY, email };
  const addressSide: ThrottleKey = { key: `address:${client.ip}`, policy: ADDRESS_SIGN_IN_POLICY };
  await takeAttempt(db, [accountSide, addressSide], (retryAfterS) => new TooManyAttemptsError(retryAfterS));

  const user = await repository.findUserByEmail(db, email);
  const passwordHash = user?.passwordHash ?? (await dummyPasswordHash());
  const matches = await verifyPassword(passwordHash, credentials.password);
  if (!user || !user.passwordHash || !matches || user.status !== 'active') {
    throw new UnauthorizedError('E-mail or password is wrong, or the account is disabled', 'invalid_credentials');
  }
  // A right password ends the account's count, and was no guess from this address.
  await clearKey(db, accountSide.key);
  if (device) await clearKey(db, accountKey(email));
  await returnAttempt(db, addressSide.key, ADDRESS_SIGN_IN_POLICY);
  await repository.touchLastSignIn(db, user.id);
  const expiresAt = new Date(Date.now() + config.SESSION_TTL_MINUTES * 60_000);
  const session = await repository.createSession(db, user.id, expiresAt, client.userAgent);
  return { session, user: toUser(user) };
}

export async function changePassword(deps: AppDeps, userId: string, change: { currentPassword: string; newPassword: string }) {
  const { db } = deps;
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
  // This process forgets at once; the others hear it from the database's notification.
  runtimeOf(deps).sessionCache.forgetUser(userId);
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
export async function setPasswordWithToken(deps: AppDeps, kind: 'invite' | 'reset', request: { token: string; password: string }) {
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
  runtimeOf(deps).sessionCache.forgetUser(user.id);
}

/**
 * Queues a reset e-mail when the address belongs to an active account. Answers the same either
 * way, so the form does not reveal who has an account. Requests are counted per e-mail address
 * and per client address, known accounts or not, and answered 429 past a few (so fifty requests
 * in a second queue three e-mails, not fifty).
 */
export async function requestPasswordReset({ db, config }: AppDeps, email: string, ip: string) {
  const address = email.toLowerCase();
  await takeAttempt(
    db,
    [
      { key: `reset:${address}`, policy: ACCOUNT_RESET_POLICY, email: address },
      { key: `reset-address:${ip}`, policy: ADDRESS_RESET_POLICY },
    ],
    (retryAfterS) => new TooManyAttemptsError(retryAfterS, 'too_many_reset_requests', 'Too many password-reset requests'),
  );
  const user = await repository.findUserByEmail(db, email);
  if (!user || user.status !== 'active') return;
  await queuePasswordResetMail(db, config, user);
}

export async function queuePasswordResetMail(
  db: Executor,
  config: Pick<Config, 'PUBLIC_URL' | 'SESSION_SECRET'>,
  user: { id: string; email: string; name: string },
) {
  const { token, tokenHash } = newAccountToken();
  const sealedLink = await sealLink(config.SESSION_SECRET, new URL(`/reset-password?token=${token}`, config.PUBLIC_URL).toString());
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
        MAIL_LINK_PLACEHOLDER,
        '',
        `The link works once and expires in ${RESET_TTL_MINUTES} minutes. If you did not ask for it, ignore this message.`,
      ].join('\n'),
      sealedLink,
    });
  });
}

export function toUser(row: { id: string; email: string; name: string; role: User['role'] }): User {
  return { id: row.id, email: row.email, name: row.name, role: row.role };
}
