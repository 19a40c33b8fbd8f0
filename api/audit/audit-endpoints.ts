import { rolesWith } from '@shared/domain/permissions';
import { auditLogPageSchema, auditLogQuerySchema } from '@shared/domain/audit';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { listAudit } from './audit-log';

export function auditEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/audit-log',
      summary: 'Every create, change, delete, restore and purge of routes, scenarios, vehicle profiles and terrain, newest first',
      tag: 'Audit',
      access: rolesWith('audit.read'),
      query: auditLogQuerySchema,
      responses: { 200: { description: 'One page of the log', schema: auditLogPageSchema } },
      handler: async ({ query, res }) => {
        const { items, total } = await listAudit(deps.db, query);
        res.json({ items, total, page: query.page, pageSize: query.pageSize });
      },
    }),
  ];
}
