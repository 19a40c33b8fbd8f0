import { rolesWith } from '@shared/domain/permissions';
import { DELETED_RETENTION_DAYS, deletedItemListSchema } from '@shared/domain/deleted-items';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { listDeletedItems } from './deleted-items-service';

export function deletedItemsEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/deleted-items',
      summary: `Routes, scenarios, vehicle profiles and terrain deleted in the last ${DELETED_RETENTION_DAYS} days; each kind has its own restore endpoint`,
      tag: 'Recently deleted',
      access: rolesWith('deleted-items.list'),
      responses: { 200: { description: 'Deleted items, newest first', schema: deletedItemListSchema } },
      handler: async ({ res }) => {
        res.json({ items: await listDeletedItems(deps.db), retentionDays: DELETED_RETENTION_DAYS });
      },
    }),
  ];
}
