import * as z from 'zod';

/** What the audit log records: every change to the work people share. */
export const AUDITED_KINDS = ['route', 'scenario', 'vehicle-profile', 'terrain', 'review-item', 'service-day'] as const;
export const auditedKindSchema = z.enum(AUDITED_KINDS);
export type AuditedKind = z.infer<typeof auditedKindSchema>;

/** The kinds that are deleted restorably (review items are never deleted: their record stays). */
export const RESTORABLE_KINDS = [
  'route',
  'scenario',
  'vehicle-profile',
  'terrain',
  'service-day',
] as const satisfies readonly AuditedKind[];
export const restorableKindSchema = z.enum(RESTORABLE_KINDS);
export type RestorableKind = z.infer<typeof restorableKindSchema>;

/** `review-decision`: a safety officer's move on a descent review item (details name the move). */
export const AUDIT_ACTIONS = ['create', 'update', 'delete', 'restore', 'purge', 'review-decision'] as const;
export const auditActionSchema = z.enum(AUDIT_ACTIONS);
export type AuditAction = z.infer<typeof auditActionSchema>;

export const AUDITED_KIND_LABELS: Readonly<Record<AuditedKind, string>> = {
  route: 'Route',
  scenario: 'Scenario',
  'vehicle-profile': 'Vehicle profile',
  terrain: 'Terrain model',
  'review-item': 'Descent review item',
  'service-day': 'Service day',
};

export const AUDIT_ACTION_LABELS: Readonly<Record<AuditAction, string>> = {
  create: 'Created',
  update: 'Changed',
  delete: 'Deleted',
  restore: 'Restored',
  purge: 'Removed for good',
  'review-decision': 'Review decision',
};

/** One recorded change. `actor` is null for changes the system made (the demo data, the 30-day purge). */
export const auditEventSchema = z.object({
  id: z.uuid(),
  at: z.iso.datetime({ offset: true }),
  actor: z.object({ id: z.uuid().nullable(), name: z.string() }),
  action: auditActionSchema,
  kind: auditedKindSchema,
  entityId: z.uuid(),
  entityName: z.string(),
  /** What else is worth knowing: the new version number, the file name, "forced" … */
  details: z.record(z.string(), z.union([z.string(), z.number(), z.boolean(), z.null()])),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;

export const auditLogQuerySchema = z.object({
  kind: auditedKindSchema.optional(),
  action: auditActionSchema.optional(),
  entityId: z.uuid().optional(),
  /** Name of the person who made the change, or part of it. */
  actor: z.string().trim().max(120).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type AuditLogQuery = z.infer<typeof auditLogQuerySchema>;

export const auditLogPageSchema = z.object({
  items: z.array(auditEventSchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});
export type AuditLogPage = z.infer<typeof auditLogPageSchema>;
