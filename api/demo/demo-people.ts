import type { Role } from '@shared/domain/roles';
import { hashPassword } from '../auth/passwords';
import type { Database } from '../db/client';
import { users } from '../db/schema/index';

/** Demo sign-in password for every demo person. Demo data only: never in production. */
export const DEMO_PASSWORD = 'descend-safely-2026';

/**
 * One invented person per role at the invented Highpass Valley Transit Authority, and a second
 * safety officer: accepting a risk takes two (one proposes, another signs off).
 */
export const DEMO_PEOPLE: ReadonlyArray<{ email: string; name: string; role: Role }> = [
  { email: 'planner@descentry.example', name: 'Mira Talvik', role: 'planner' },
  { email: 'analyst@descentry.example', name: 'Oskar Brenner', role: 'analyst' },
  { email: 'safety@descentry.example', name: 'Ilse Rautenberg', role: 'safety' },
  { email: 'second.safety@descentry.example', name: 'Tomas Venzl', role: 'safety' },
  { email: 'board@descentry.example', name: 'Jonas Feldmoser', role: 'board' },
  { email: 'admin@descentry.example', name: 'Agnes Wyler', role: 'admin' },
];

/** Creates the demo people, or resets their role, status and password when they exist. */
export async function seedDemoPeople(db: Database): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const person of DEMO_PEOPLE) {
    await db
      .insert(users)
      .values({ ...person, status: 'active', passwordHash, passwordChangedAt: new Date() })
      .onConflictDoUpdate({
        target: users.email,
        set: { name: person.name, role: person.role, status: 'active', passwordHash },
      });
  }
}
