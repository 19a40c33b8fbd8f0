import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { claimDueMail, markAttemptFailed, markSent } from './outbox';

/** Give up after this many attempts; the message stays in the outbox marked failed. */
export const MAX_MAIL_ATTEMPTS = 8;
const LEASE_S = 60;

export function createSmtpTransport(config: Pick<Config, 'SMTP_HOST' | 'SMTP_PORT' | 'SMTP_SECURE' | 'SMTP_USER' | 'SMTP_PASSWORD'>): Transporter {
  return nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE,
    // The local fake speaks plain SMTP; a real relay with STARTTLS sets SMTP_SECURE or upgrades.
    ignoreTLS: !config.SMTP_SECURE && !config.SMTP_USER,
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASSWORD ?? '' } : undefined,
    connectionTimeout: 10_000,
  });
}

/** Exponential back-off: 30 s, 1 min, 2 min … capped at one hour. */
export function retryDelayS(attempt: number): number {
  return Math.min(3600, 30 * 2 ** Math.max(0, attempt - 1));
}

/** Sends what is due once; returns how many messages were sent. */
export async function deliverDueMail(db: Database, transport: Transporter, from: string): Promise<number> {
  const due = await claimDueMail(db, 20, LEASE_S);
  let sent = 0;
  for (const message of due) {
    const attempt = message.attempts + 1;
    try {
      await transport.sendMail({ from, to: message.toAddress, subject: message.subject, text: message.textBody });
      await markSent(db, message.id);
      sent += 1;
    } catch (error) {
      // SMTP down or refusing: keep the message and try again later.
      const reason = error instanceof Error ? error.message : String(error);
      const retryAt = attempt >= MAX_MAIL_ATTEMPTS ? null : new Date(Date.now() + retryDelayS(attempt) * 1000);
      await markAttemptFailed(db, message.id, reason, retryAt);
    }
  }
  return sent;
}

/** Polls the outbox until stopped. */
export function startMailWorker(db: Database, transport: Transporter, from: string, intervalMs = 1000) {
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  const tick = async () => {
    try {
      await deliverDueMail(db, transport, from);
    } catch (error) {
      // A database hiccup must not kill the worker; the next tick tries again.
      console.error('[mail] outbox delivery failed:', error);
    }
    if (!stopped) timer = setTimeout(tick, intervalMs);
  };
  timer = setTimeout(tick, 0);
  return {
    stop() {
      stopped = true;
      clearTimeout(timer);
    },
  };
}
