import { createServer } from 'node:net';
import { eq } from 'drizzle-orm';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { mailOutbox } from '../../../api/db/schema/index';
import nodemailer from 'nodemailer';
import request from 'supertest';
import {
  MAIL_CLAIM_S,
  MAX_MAIL_ATTEMPTS,
  SMTP_TIMEOUTS_MS,
  createSmtpTransport,
  deliverDueMail,
  retryDelayS,
} from '../../../api/mail/mail-worker';
import { claimDueMail, enqueueMail } from '../../../api/mail/outbox';
import { MAIL_LINK_PLACEHOLDER } from '../../../api/mail/sealed-link';
import { tokenFromLink } from '../../support/mail-catcher';
import { startMailCatcher } from '../../support/mail-catcher';
import { SPEC_SESSION_SECRET, createTestContext, signedInAgent } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
const { db } = context;
const DELIVERY = { from: 'from@spec.example', secret: SPEC_SESSION_SECRET };

beforeEach(() => truncateAll(db));
afterAll(() => context.close());

describe('mail outbox worker', () => {
  it('keeps a message queued with the error while SMTP is down, then sends it once SMTP is back', async () => {
    await enqueueMail(db, { to: 'ops@spec.example', subject: 'Queued while down', textBody: 'body' });
    const downPort = await unusedPort();
    const down = createSmtpTransport({
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: downPort,
      SMTP_SECURE: false,
      SMTP_USER: undefined,
      SMTP_PASSWORD: undefined,
    });

    expect(await deliverDueMail(db, down, DELIVERY)).toBe(0);
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
    const down = createSmtpTransport({
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: await unusedPort(),
      SMTP_SECURE: false,
      SMTP_USER: undefined,
      SMTP_PASSWORD: undefined,
    });

    await deliverDueMail(db, down, DELIVERY);

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

  it('gives up on a silent relay well inside the claim on a message (issue 11)', () => {
    const transport = createSmtpTransport({
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: 2525,
      SMTP_SECURE: false,
      SMTP_USER: undefined,
      SMTP_PASSWORD: undefined,
    });
    const options = transport.options as { connectionTimeout?: number; greetingTimeout?: number; socketTimeout?: number };

    expect(options.socketTimeout).toBe(SMTP_TIMEOUTS_MS.socket);
    expect(options.greetingTimeout).toBe(SMTP_TIMEOUTS_MS.greeting);
    expect(options.connectionTimeout).toBe(SMTP_TIMEOUTS_MS.connection);
    expect(SMTP_TIMEOUTS_MS.connection + SMTP_TIMEOUTS_MS.socket).toBeLessThan(MAIL_CLAIM_S * 1000);
    transport.close();
  });

  it('keeps its claim on a message while a relay that greets and goes silent holds it, so no other worker sends it (issue 11)', async () => {
    await enqueueMail(db, { to: 'ops@spec.example', subject: 'Slow relay', textBody: 'body' });
    const relay = await silentRelay();
    const slow = nodemailer.createTransport({ host: '127.0.0.1', port: relay.port, secure: false, ignoreTLS: true, socketTimeout: 2_500 });

    const delivering = deliverDueMail(db, slow, { ...DELIVERY, claimS: 1 });
    await new Promise((resolve) => setTimeout(resolve, 1_700));
    const otherWorker = await claimDueMail(db, 20, 1);
    const sent = await delivering;

    expect(otherWorker.messages).toEqual([]);
    expect(sent).toBe(0);
    const [row] = await db.select().from(mailOutbox);
    expect(row).toMatchObject({ status: 'queued', attempts: 1 });
    expect(row!.lastError).toMatch(/timeout/i);
    slow.close();
    await relay.close();
  });

  it('backs off exponentially up to an hour', () => {
    expect([1, 2, 3, 4].map(retryDelayS)).toEqual([30, 60, 120, 240]);
    expect(retryDelayS(20)).toBe(3600);
  });
});

describe('links in invitations and resets (issue 11)', () => {
  it('stores no usable link in the outbox, shows none to administrators, and sends the working one', async () => {
    const { agent: admin } = await signedInAgent(context.app, db, 'admin');
    const catcher = await startMailCatcher(db);
    try {
      await admin.post('/api/people').send({ email: 'newcomer@spec.example', name: 'Newcomer', role: 'planner' });
      const [stored] = await db.select().from(mailOutbox);
      const outboxScreen = await admin.get('/api/mail/outbox');

      await catcher.deliver();
      const received = await catcher.lastMessageTo('newcomer@spec.example');
      const [afterSending] = await db.select().from(mailOutbox);
      const caughtScreen = await admin.get('/api/mail/captured');
      const token = tokenFromLink(received!.textBody);
      const info = await request(context.app).post('/api/auth/token-info').send({ token });

      expect(stored!.textBody).toContain(MAIL_LINK_PLACEHOLDER);
      expect(stored!.textBody).not.toMatch(/token=/);
      expect(stored!.sealedLink).toMatch(/^[\w-]+\.\.[\w-]+\.[\w-]+\.[\w-]+$/);
      expect(JSON.stringify(outboxScreen.body)).not.toMatch(/token=/);
      expect(received!.textBody).toMatch(/http:\/\/127\.0\.0\.1:4300\/accept-invite\?token=[\w-]{20,}/);
      expect(info.status).toBe(200);
      expect(afterSending).toMatchObject({ status: 'sent', sealedLink: null });
      expect(JSON.stringify(caughtScreen.body)).toContain('token=••••••');
      expect(JSON.stringify(caughtScreen.body)).not.toContain(token);
    } finally {
      await catcher.close();
    }
  });
});

// Helpers

/** An SMTP "relay" that accepts the connection, greets, and then never answers. */
async function silentRelay(): Promise<{ port: number; close: () => Promise<void> }> {
  const sockets = new Set<import('node:net').Socket>();
  const server = createServer((socket) => {
    sockets.add(socket);
    socket.on('error', () => undefined);
    socket.write('220 relay.spec.example ESMTP\r\n');
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const address = server.address();
  return {
    port: typeof address === 'object' && address ? address.port : 0,
    close: () =>
      new Promise<void>((resolve) => {
        for (const socket of sockets) socket.destroy();
        server.close(() => resolve());
      }),
  };
}

function unusedPort(): Promise<number> {
  return new Promise((resolve) => {
    const server = createServer().listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}
