import { index, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { AUDIT_ACTIONS, AUDITED_KINDS } from '@shared/domain/audit';

/**
 * Every create, change, delete, restore and purge of routes, scenarios, vehicle profiles and
 * terrain, written in the same transaction as the change. Append-only: no endpoint changes it and
 * a trigger refuses UPDATE and DELETE (migrations). No foreign keys: the record outlives what it
 * describes.
 */
export const auditLog = pgTable(
  'audit_log',
  {
    id: uuid().primaryKey().defaultRandom(),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
    actorId: uuid(),
    actorName: text().notNull(),
    action: text({ enum: AUDIT_ACTIONS }).notNull(),
    entityKind: text({ enum: AUDITED_KINDS }).notNull(),
    entityId: uuid().notNull(),
    entityName: text().notNull(),
    details: jsonb().$type<Record<string, string | number | boolean | null>>().notNull().default({}),
  },
  (table) => [index('audit_log_at_idx').on(table.at), index('audit_log_entity_idx').on(table.entityKind, table.entityId)],
);
export type AuditLogRow = typeof auditLog.$inferSelect;
