import { createServer } from 'node:net';
import { eq } from 'drizzle-orm';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { mailOutbox } from '../../../api/db/schema/index';
import { MAX_MAIL_ATTEMPTS, createSmtpTransport, deliverDueMail, retryDelayS } from '../../../api/mail/mail-worker';
import { enqueueMail } from '../../../api/mail/outbox';
import { startMailCatcher } from '../../support/mail-catcher';
import { createTestContext } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { db } = context;

beforeEach(() => truncateAll(db));
afterAll(() => context.close());

describe('mail outbox worker', () => {
  it('keeps a message queued with the error while SMTP is down, then sends it once SMTP is back', async () => {
    await enqueueMail(db, { to: 'ops@spec.example', subject: 'Queued while down', textBody: 'body' });
    const downPort = await unusedPort();
    const down = createSmtpTransport({ SMTP_HOST: '127.0.0.1', SMTP_PORT: downPort, SMTP_SECURE: false, SMTP_USER: undefined, SMTP_PASSWORD: undefined });

    expect(await deliverDueMail(db, down, 'from@spec.example')).toBe(0);
    const [afterFailure] = await db.select().from(mailOutbox);
    expect(afterFailure).toMatchObject({ status: 'queued', attempts: 1 });
    expect(afterFailure!.lastError).toMatch(/ECONNREFUSED|connect/i);
    expect(afterFailure!.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());

    await db.update(mailOutbox).set({ nextAttemptAt: new Date() }).where(eq(mailOutbox.id, afterFailure!.id));
    const catcher = await startMailCatcher(db);
    try {
      expect(await catcher.deliver()).toBe(1);
      const [sent] = await db.select().from(mailOutbox);
      expect(sent).toMatchObject({ status: 'sent', attempts: 2, lastError: null });
      expect((await catcher.lastMessageTo('ops@spec.example'))?.subject).toBe('Queued while down');
    } finally {
      await catcher.close();
    }
  });

  it('marks a message failed after the last attempt', async () => {
    await enqueueMail(db, { to: 'ops@spec.example', subject: 'Never', textBody: 'body' });
    await db.update(mailOutbox).set({ attempts: MAX_MAIL_ATTEMPTS - 1 });
    const down = createSmtpTransport({ SMTP_HOST: '127.0.0.1', SMTP_PORT: await unusedPort(), SMTP_SECURE: false, SMTP_USER: undefined, SMTP_PASSWORD: undefined });

    await deliverDueMail(db, down, 'from@spec.example');

    const [row] = await db.select().from(mailOutbox);
    expect(row).toMatchObject({ status: 'failed', attempts: MAX_MAIL_ATTEMPTS });
  });

  it('does not send a message that another worker has claimed', async () => {
    await enqueueMail(db, { to: 'ops@spec.example', subject: 'Once', textBody: 'body' });
    const catcher = await startMailCatcher(db);
    try {
      const [first, second] = await Promise.all([catcher.deliver(), catcher.deliver()]);
      expect(first + second).toBe(1);
    } finally {
      await catcher.close();
    }
  });

  it('backs off exponentially up to an hour', () => {
    expect([1, 2, 3, 4].map(retryDelayS)).toEqual([30, 60, 120, 240]);
    expect(retryDelayS(20)).toBe(3600);
  });
});

// Helpers

function unusedPort(): Promise<number> {
  return new Promise((resolve) => {
    const server = createServer().listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}
