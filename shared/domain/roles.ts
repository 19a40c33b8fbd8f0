import * as z from 'zod';

/**
 * The five kinds of people who use Descentry. Each role may change only its own kind of data;
 * every role may read what it needs. Each endpoint's `access` (api/endpoints.ts) states who may
 * call it, and spec/api/authorization-matrix.spec.ts checks it as every role.
 */
export const ROLES = ['planner', 'analyst', 'safety', 'board', 'admin'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** Plain-English names shown in the interface. */
export const ROLE_LABELS: Readonly<Record<Role, string>> = {
  planner: 'Transit planner',
  analyst: 'Energy & terrain analyst',
  safety: 'Safety officer',
  board: 'Board member',
  admin: 'Administrator',
};
