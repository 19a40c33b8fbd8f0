import { and, count, desc, eq, ilike, type SQL } from 'drizzle-orm';
import type { AuditAction, AuditEvent, AuditLogQuery, AuditedKind } from '@shared/domain/audit';
import type { Executor } from '../db/client';
import { auditLog, type AuditLogRow } from '../db/schema/index';

/** Who made a change: a signed-in person, or the system (id null: the demo data, the purge). */
export interface Actor {
  id: string | null;
  name: string;
}

/** The name the purge and other system changes are recorded under. */
export const SYSTEM_ACTOR: Actor = { id: null, name: 'Descentry (automatic)' };

export interface AuditEntry {
  action: AuditAction;
  kind: AuditedKind;
  entityId: string;
  entityName: string;
  details?: AuditEvent['details'];
}

/** Records one change; call it with the transaction that makes the change. */
export async function recordAudit(db: Executor, actor: Actor, entry: AuditEntry): Promise<void> {
  await db.insert(auditLog).values({
    actorId: actor.id,
    actorName: actor.name,
    action: entry.action,
    entityKind: entry.kind,
    entityId: entry.entityId,
    entityName: entry.entityName,
    details: entry.details ?? {},
  });
}

/** One page of the log, newest first, filtered as asked. */
export async function listAudit(db: Executor, query: AuditLogQuery): Promise<{ items: AuditEvent[]; total: number }> {
  const conditions: SQL[] = [];
  if (query.kind) conditions.push(eq(auditLog.entityKind, query.kind));
  if (query.action) conditions.push(eq(auditLog.action, query.action));
  if (query.entityId) conditions.push(eq(auditLog.entityId, query.entityId));
  if (query.actor) conditions.push(ilike(auditLog.actorName, `%${query.actor.replace(/[\\%_]/g, (c) => `\\${c}`)}%`));
  const where = and(...conditions);
  const rows = await db
    .select()
    .from(auditLog)
    .where(where)
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  const [total] = await db.select({ n: count() }).from(auditLog).where(where);
  return { items: rows.map(toAuditEvent), total: total?.n ?? 0 };
}

function toAuditEvent(row: AuditLogRow): AuditEvent {
  return {
    id: row.id,
    at: row.at.toISOString(),
    actor: { id: row.actorId, name: row.actorName },
    action: row.action,
    kind: row.entityKind,
    entityId: row.entityId,
    entityName: row.entityName,
    details: row.details,
  };
}
