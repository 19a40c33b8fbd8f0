import { desc, eq } from 'drizzle-orm';
import type { Database } from '../../api/db/client';
import { capturedMail } from '../../api/db/schema/index';
import { createSmtpTransport, deliverDueMail } from '../../api/mail/mail-worker';
import { startSmtpFake } from '../../api/mail/smtp-fake';
import { SPEC_SESSION_SECRET } from './test-app';

/** The real SMTP fake on a free port plus a transport pointing at it. */
export async function startMailCatcher(db: Database, secret = SPEC_SESSION_SECRET) {
  const fake = await startSmtpFake(db, 0);
  const transport = createSmtpTransport({
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: fake.port,
    SMTP_SECURE: false,
    SMTP_USER: undefined,
    SMTP_PASSWORD: undefined,
  });
  return {
    port: fake.port,
    /** Runs the outbox worker once, as the background worker would. */
    deliver: () => deliverDueMail(db, transport, { from: 'Descentry <no-reply@descentry.example>', secret }),
    async lastMessageTo(address: string) {
      const [message] = await db
        .select()
        .from(capturedMail)
        .where(eq(capturedMail.toAddress, address))
        .orderBy(desc(capturedMail.receivedAt))
        .limit(1);
      return message;
    },
    close: async () => {
      transport.close();
      await fake.close();
    },
  };
}

export function tokenFromLink(body: string): string {
  const match = /[?&]token=([A-Za-z0-9_-]+)/.exec(body);
  if (!match) throw new Error(`no token link in:\n${body}`);
  return match[1]!;
}
