import { eq } from 'drizzle-orm';
import type { Executor } from '../db/client';
import { users, type UserRow } from '../db/schema/index';

type StoredSettings = UserRow['notificationSettings'];

/** A person's stored e-mail switches (users.notification_settings); undefined when there is no such person. */
export async function findNotificationSettings(db: Executor, userId: string): Promise<StoredSettings | undefined> {
  const [row] = await db.select({ notificationSettings: users.notificationSettings }).from(users).where(eq(users.id, userId));
  return row?.notificationSettings;
}

/** Stores a person's e-mail switches and answers what was stored. */
export async function saveNotificationSettings(
  db: Executor,
  userId: string,
  settings: StoredSettings,
): Promise<StoredSettings | undefined> {
  const [row] = await db
    .update(users)
    .set({ notificationSettings: settings })
    .where(eq(users.id, userId))
    .returning({ notificationSettings: users.notificationSettings });
  return row?.notificationSettings;
}
