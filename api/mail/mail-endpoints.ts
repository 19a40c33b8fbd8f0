import { rolesWith } from '@shared/domain/permissions';
import { capturedMailListSchema, outgoingMailListSchema } from '@shared/domain/mail';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { listCapturedMail, listOutbox } from './outbox';
import { maskLinkTokens } from './sealed-link';

export function mailEndpoints({ db }: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/mail/outbox',
      summary: 'Messages queued, sent or failed (newest first)',
      tag: 'Mail',
      access: rolesWith('mail.read'),
      responses: { 200: { description: 'Outbox', schema: outgoingMailListSchema } },
      handler: async ({ res }) => {
        const rows = await listOutbox(db);
        res.json({
          items: rows.map((row) => ({
            id: row.id,
            to: row.toAddress,
            subject: row.subject,
            // Stored bodies hold no live link (sealed beside them); older rows are masked all the same.
            textBody: maskLinkTokens(row.textBody),
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
      access: rolesWith('mail.read'),
      responses: { 200: { description: 'Captured messages', schema: capturedMailListSchema } },
      handler: async ({ res }) => {
        const rows = await listCapturedMail(db);
        res.json({
          items: rows.map((row) => ({
            id: row.id,
            from: row.fromAddress,
            to: row.toAddress,
            subject: row.subject,
            // What the catcher received is the recipient's copy: its links would let an
            // administrator act as that person, so their tokens are hidden here.
            textBody: maskLinkTokens(row.textBody),
            receivedAt: row.receivedAt.toISOString(),
          })),
        });
      },
    }),
  ];
}
