import { defineConfig } from 'drizzle-kit';

export default defineConfig({
  dialect: 'postgresql',
  schema: './api/db/schema/index.ts',
  out: './migrations',
  casing: 'snake_case',
  dbCredentials: { url: process.env['DATABASE_URL'] ?? '' },
  // PostGIS owns these; drizzle-kit must not try to manage them.
  extensionsFilters: ['postgis'],
  strict: true,
});
