import type { InviteRequest, UpdatePersonRequest } from '@shared/domain/people';
import type { AppDeps } from '../app-deps';
import { INVITE_TTL_HOURS, newAccountToken } from '../auth/account-tokens';
import { findUserByEmail, findUserById, insertAccountToken, revokeAllSessions } from '../auth/auth-repository';
import { queuePasswordResetMail } from '../auth/auth-service';
import { ConflictError, HttpError, NotFoundError } from '../http/http-error';
import { enqueueMail } from '../mail/outbox';
import { MAIL_LINK_PLACEHOLDER, sealLink } from '../mail/sealed-link';
import { ROLE_LABELS } from '@shared/domain/roles';
import * as repository from './people-repository';
import type { Person } from '@shared/domain/people';
import type { Executor } from '../db/client';
import type { UserRow } from '../db/schema/index';
import { accountSignInStates, clearAccount } from '../auth/attempt-throttle';
import { isUniqueViolation } from '../db/errors';
import { runtimeOf } from '../app-runtime';

/** Everyone with an account, with their sign-in slow-down if any. */
export async function listPeople({ db }: AppDeps): Promise<Person[]> {
  const rows = await repository.listPeople(db);
  const states = await accountSignInStates(
    db,
    rows.map((row) => row.email),
  );
  return rows.map((row) => repository.toPerson(row, states.get(row.email)));
}

async function personWithState(db: Executor, row: UserRow): Promise<Person> {
  return repository.toPerson(row, (await accountSignInStates(db, [row.email])).get(row.email));
}

/** Lifts the sign-in slow-down of an account (and its reset-request count). */
export async function liftSignInLimit({ db }: AppDeps, personId: string): Promise<Person> {
  const person = await findUserById(db, personId);
  if (!person) throw new NotFoundError('Person');
  await clearAccount(db, person.email);
  return personWithState(db, person);
}

/** Creates the person and queues their invitation in one transaction. */
export async function invitePerson({ db, config }: AppDeps, invitedBy: { name: string }, request: InviteRequest) {
  const taken = () => new ConflictError(`${request.email} already has an account`, 'email_taken');
  if (await findUserByEmail(db, request.email)) throw taken();
  const { token, tokenHash } = newAccountToken();
  const sealedLink = await sealLink(config.SESSION_SECRET, new URL(`/accept-invite?token=${token}`, config.PUBLIC_URL).toString());
  const row = await db.transaction(async (tx) => {
    // Two invitations for one address at the same moment: the unique e-mail index lets one in.
    const person = await repository.insertPerson(tx, request).catch((error: unknown) => {
      throw isUniqueViolation(error) ? taken() : error;
    });
    await insertAccountToken(tx, {
      userId: person.id,
      kind: 'invite',
      tokenHash,
      expiresAt: new Date(Date.now() + INVITE_TTL_HOURS * 3_600_000),
    });
    await enqueueMail(tx, {
      to: person.email,
      subject: 'You are invited to Descentry',
      textBody: [
        `Hello ${person.name},`,
        '',
        `${invitedBy.name} has invited you to Descentry as ${ROLE_LABELS[person.role].toLowerCase()}.`,
        'To choose your password and sign in, open:',
        MAIL_LINK_PLACEHOLDER,
        '',
        `The link works once and expires in ${INVITE_TTL_HOURS} hours.`,
      ].join('\n'),
      sealedLink,
    });
    return person;
  });
  return personWithState(db, row);
}

export async function updatePerson(deps: AppDeps, actorId: string, personId: string, update: UpdatePersonRequest) {
  const { db } = deps;
  if (personId === actorId && (update.status === 'disabled' || (update.role && update.role !== 'admin'))) {
    throw new HttpError(409, 'own_account', 'You cannot disable your own account or remove your own admin role');
  }
  const existing = await findUserById(db, personId);
  if (!existing) throw new NotFoundError('Person');
  if (update.status === 'active' && existing.status === 'invited') {
    throw new ConflictError('This person has not accepted the invitation yet', 'still_invited');
  }
  const row = await db.transaction(async (tx) => {
    const updated = await repository.updatePerson(tx, personId, update);
    // A disabled account or a changed role must not keep sessions issued under the old rights.
    if (update.status === 'disabled' || (update.role && update.role !== existing.role)) {
      await revokeAllSessions(tx, personId);
    }
    return updated!;
  });
  // This process forgets at once; the others hear it from the database's notification.
  runtimeOf(deps).sessionCache.forgetUser(personId);
  return personWithState(db, row);
}

export async function sendPasswordReset({ db, config }: AppDeps, personId: string) {
  const person = await findUserById(db, personId);
  if (!person) throw new NotFoundError('Person');
  if (person.status !== 'active') {
    throw new ConflictError('Only active accounts can reset their password', 'not_active');
  }
  await queuePasswordResetMail(db, config, person);
}
