import * as z from 'zod';

export const OUTBOX_STATUSES = ['queued', 'sent', 'failed'] as const;

/** One message in the outbox: queued with the change that caused it, sent by the mail worker. */
export const outgoingMailSchema = z.object({
  id: z.uuid(),
  to: z.string(),
  subject: z.string(),
  textBody: z.string(),
  status: z.enum(OUTBOX_STATUSES),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.iso.datetime({ offset: true }),
  sentAt: z.iso.datetime({ offset: true }).nullable(),
});
export type OutgoingMail = z.infer<typeof outgoingMailSchema>;
export const outgoingMailListSchema = z.object({ items: z.array(outgoingMailSchema) });

/** A message as the local SMTP fake received it (development and tests only). */
export const capturedMailSchema = z.object({
  id: z.uuid(),
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  textBody: z.string(),
  receivedAt: z.iso.datetime({ offset: true }),
});
export type CapturedMail = z.infer<typeof capturedMailSchema>;
export const capturedMailListSchema = z.object({ items: z.array(capturedMailSchema) });
