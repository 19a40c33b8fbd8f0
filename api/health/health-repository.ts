import { sql } from 'drizzle-orm';
import type { Executor } from '../db/client';

/** The smallest round trip to the database: resolves when it answers. */
export async function pingDatabase(db: Executor): Promise<void> {
  await db.execute(sql`select 1`);
}
