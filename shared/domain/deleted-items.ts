import * as z from 'zod';
import { restorableKindSchema } from './audit';

/** How long a deleted route, scenario, vehicle profile or terrain model can be restored, days. */
export const DELETED_RETENTION_DAYS = 30;

/** Something deleted within the last DELETED_RETENTION_DAYS, restorable until `removedAfter`. */
export const deletedItemSchema = z.object({
  kind: restorableKindSchema,
  id: z.uuid(),
  name: z.string(),
  deletedAt: z.iso.datetime({ offset: true }),
  deletedBy: z.string().nullable(),
  /** When the maintenance sweep removes it for good. */
  removedAfter: z.iso.datetime({ offset: true }),
  /** Why it cannot be restored as it is (its route is deleted too …); null when it can. */
  blockedBy: z.string().nullable(),
});
export type DeletedItem = z.infer<typeof deletedItemSchema>;

export const deletedItemListSchema = z.object({ items: z.array(deletedItemSchema), retentionDays: z.number().int() });
export type DeletedItemList = z.infer<typeof deletedItemListSchema>;

export const deletedItemParamsSchema = z.object({ kind: restorableKindSchema, id: z.uuid() });
