import type { Express } from 'express';
import request from 'supertest';
import type { Role } from '@shared/domain/roles';
import { createApp } from '../../api/app';
import type { AppDeps } from '../../api/app-deps';
import { AppRuntime } from '../../api/app-runtime';
import { hashPassword } from '../../api/auth/passwords';
import { loadConfig, type Config } from '../../api/config';
import { createDatabase, type Database } from '../../api/db/client';
import { users } from '../../api/db/schema/index';
import { truncateAll } from './test-database';

export const TEST_PASSWORD = 'test-password-for-specs';
/** The SESSION_SECRET of the specs' configuration (mail links are sealed with it). */
export const SPEC_SESSION_SECRET = 'spec-secret-spec-secret-spec-secret-0000';

export function testConfig(overrides: Partial<Record<keyof Config, string>> = {}): Config {
  const databaseUrl = process.env['DATABASE_URL'];
  if (!databaseUrl) throw new Error('API specs need DATABASE_URL (run them through `npm test`)');
  return loadConfig({
    NODE_ENV: 'test',
    DATABASE_URL: databaseUrl,
    SESSION_SECRET: SPEC_SESSION_SECRET,
    PUBLIC_URL: 'http://127.0.0.1:4300',
    WEB_DIR: '',
    DATA_DIR: '.var/spec-data',
    RUN_WORKERS: 'false',
    ...overrides,
  });
}

export interface TestContext {
  app: Express;
  db: Database;
  deps: AppDeps;
  close: () => Promise<void>;
}

/**
 * The real app on the real test database, with a runtime of its own (its caches, analysis threads
 * and terrain runtime, as one API process has); call `close` in afterAll: it closes the runtime,
 * then the database.
 */
export function createTestContext(overrides: Partial<Record<keyof Config, string>> = {}): TestContext {
  const config = testConfig(overrides);
  const { db, close } = createDatabase(config.DATABASE_URL, {
    max: 5,
    connectTimeoutS: config.DB_CONNECT_TIMEOUT_S,
    statementTimeoutMs: config.DB_STATEMENT_TIMEOUT_MS,
  });
  // The runtime is made now, so every app or copy built from these deps shares it (runtimeOf).
  const runtime = new AppRuntime({ db, config });
  const deps: AppDeps = { db, config, runtime };
  return {
    app: createApp(deps),
    db,
    deps,
    close: async () => {
      await runtime.close();
      await close();
    },
  };
}

/**
 * The afterAll of a spec file that wrote terrain, base maps or other files into a temporary
 * folder of its own: empties every table (the next file starts from nothing), closes the context
 * (its runtime, terrain decoder and tile threads included, then the database) and then removes
 * the folder, once no thread holds its files open. The folder goes even when closing fails.
 */
export async function emptyAndCloseTestContext(context: TestContext, folder: { remove: () => void }): Promise<void> {
  try {
    await truncateAll(context.db);
    await context.close();
  } finally {
    folder.remove();
  }
}

let passwordHash: Promise<string> | undefined;

/** Inserts an active person with TEST_PASSWORD. */
export async function aPerson(
  db: Database,
  overrides: { role?: Role; email?: string; name?: string; status?: 'active' | 'disabled' | 'invited' } = {},
) {
  passwordHash ??= hashPassword(TEST_PASSWORD);
  const role = overrides.role ?? 'planner';
  const [row] = await db
    .insert(users)
    .values({
      email: overrides.email ?? `${role}-${Math.random().toString(36).slice(2, 10)}@spec.example`,
      name: overrides.name ?? `Spec ${role}`,
      role,
      status: overrides.status ?? 'active',
      passwordHash: await passwordHash,
    })
    .returning();
  return row!;
}

/** A supertest agent that keeps cookies, signed in as a new person with the given role. */
export async function signedInAgent(app: Express, db: Database, role: Role) {
  const person = await aPerson(db, { role });
  const agent = request.agent(app);
  const response = await agent.post('/api/auth/login').send({ email: person.email, password: TEST_PASSWORD });
  if (response.status !== 200) throw new Error(`sign-in as ${role} failed: ${response.status} ${response.text}`);
  return { agent, person };
}
