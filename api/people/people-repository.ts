import { asc, eq } from 'drizzle-orm';
import type { Person } from '@shared/domain/people';
import type { Executor } from '../db/client';
import { users, type UserRow } from '../db/schema/index';

export function listPeople(db: Executor) {
  return db.select().from(users).orderBy(asc(users.name));
}

export async function insertPerson(db: Executor, person: { email: string; name: string; role: UserRow['role'] }) {
  const [row] = await db
    .insert(users)
    .values({ ...person, status: 'invited' })
    .returning();
  return row!;
}

export async function updatePerson(db: Executor, personId: string, update: Partial<Pick<UserRow, 'role' | 'status' | 'name'>>) {
  const [row] = await db.update(users).set(update).where(eq(users.id, personId)).returning();
  return row;
}

export function toPerson(row: UserRow, signIn: { failedAttempts: number; slowedUntil: Date | null } = NOT_THROTTLED): Person {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    status: row.status,
    createdAt: row.createdAt.toISOString(),
    lastSignInAt: row.lastSignInAt?.toISOString() ?? null,
    signIn: { failedAttempts: signIn.failedAttempts, slowedUntil: signIn.slowedUntil?.toISOString() ?? null },
  };
}

const NOT_THROTTLED = { failedAttempts: 0, slowedUntil: null };
