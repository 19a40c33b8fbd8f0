import type { Role } from '@shared/domain/roles';
import type { Config } from '../../api/config';
import type { Database } from '../../api/db/client';
import { createSession } from '../../api/auth/auth-repository';
import { SESSION_COOKIE, signSessionToken } from '../../api/auth/session-tokens';
import { aPerson } from './test-app';

/**
 * A fresh session cookie for a person of `role`, made without the sign-in endpoint (fast, and
 * unaffected by sign-in rate limits). One person per role is reused.
 */
export function sessionCookies(db: Database, config: Config) {
  const people = new Map<Role, Promise<{ id: string }>>();
  return async (role: Role): Promise<string> => {
    if (!people.has(role)) people.set(role, aPerson(db, { role }));
    const person = await people.get(role)!;
    const session = await createSession(db, person.id, new Date(Date.now() + 3_600_000), 'spec');
    const token = await signSessionToken(config.SESSION_SECRET, { sessionId: session.id, userId: person.id }, 60);
    return `${SESSION_COOKIE}=${token}`;
  };
}
