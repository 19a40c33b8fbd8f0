import type { InviteRequest, UpdatePersonRequest } from '@shared/domain/people';
import type { AppDeps } from '../app-deps';
import { INVITE_TTL_HOURS, newAccountToken } from '../auth/account-tokens';
import { findUserByEmail, findUserById, insertAccountToken, revokeAllSessions } from '../auth/auth-repository';
import { queuePasswordResetMail } from '../auth/auth-service';
import { ConflictError, HttpError, NotFoundError } from '../http/http-error';
import { enqueueMail } from '../mail/outbox';
import { ROLE_LABELS } from '@shared/domain/roles';
import * as repository from './people-repository';

/** Creates the person and queues their invitation in one transaction. */
export async function invitePerson({ db, config }: AppDeps, invitedBy: { name: string }, request: InviteRequest) {
  if (await findUserByEmail(db, request.email)) {
    throw new ConflictError(`${request.email} already has an account`, 'email_taken');
  }
  const { token, tokenHash } = newAccountToken();
  const link = new URL(`/accept-invite?token=${token}`, config.PUBLIC_URL).toString();
  const row = await db.transaction(async (tx) => {
    const person = await repository.insertPerson(tx, request);
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
        link,
        '',
        `The link works once and expires in ${INVITE_TTL_HOURS} hours.`,
      ].join('\n'),
    });
    return person;
  });
  return repository.toPerson(row);
}

export async function updatePerson({ db }: AppDeps, actorId: string, personId: string, update: UpdatePersonRequest) {
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
  return repository.toPerson(row);
}

export async function sendPasswordReset({ db, config }: AppDeps, personId: string) {
  const person = await findUserById(db, personId);
  if (!person) throw new NotFoundError('Person');
  if (person.status !== 'active') {
    throw new ConflictError('Only active accounts can reset their password', 'not_active');
  }
  await queuePasswordResetMail(db, config.PUBLIC_URL, person);
}
