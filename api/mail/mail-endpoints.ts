import { capturedMailListSchema, outgoingMailListSchema } from '@shared/domain/mail';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { listCapturedMail, listOutbox } from './outbox';

export function mailEndpoints({ db }: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/mail/outbox',
      summary: 'Messages queued, sent or failed (newest first)',
      tag: 'Mail',
      access: ['admin'],
      responses: { 200: { description: 'Outbox', schema: outgoingMailListSchema } },
      handler: async ({ res }) => {
        const rows = await listOutbox(db);
        res.json({
          items: rows.map((row) => ({
            id: row.id,
            to: row.toAddress,
            subject: row.subject,
            textBody: row.textBody,
            status: row.status,
            attempts: row.attempts,
            lastError: row.lastError,
            createdAt: row.createdAt.toISOString(),
            sentAt: row.sentAt?.toISOString() ?? null,
          })),
        });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/mail/captured',
      summary: 'Messages the local mail catcher received (development and tests)',
      tag: 'Mail',
      access: ['admin'],
      responses: { 200: { description: 'Captured messages', schema: capturedMailListSchema } },
      handler: async ({ res }) => {
        const rows = await listCapturedMail(db);
        res.json({
          items: rows.map((row) => ({
            id: row.id,
            from: row.fromAddress,
            to: row.toAddress,
            subject: row.subject,
            textBody: row.textBody,
            receivedAt: row.receivedAt.toISOString(),
          })),
        });
      },
    }),
  ];
}
