import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';
import type { Database } from '../db/client';
import type { OutboxRow } from '../db/schema/index';
import { claimDueMail, extendClaim, markAttemptFailed, markSent } from './outbox';
import { MAIL_LINK_PLACEHOLDER, openSealedLink } from './sealed-link';

/** Give up after this many attempts; the message stays in the outbox marked failed. */
export const MAX_MAIL_ATTEMPTS = 8;
/** How long a worker's claim on a message lasts before another worker may take it, s. */
export const MAIL_CLAIM_S = 60;
/**
 * SMTP time limits, ms, all well inside the claim: a relay that accepts the connection and then
 * goes silent costs at most this long (nodemailer's own defaults are 2 and 10 minutes, past the
 * claim, so a second worker would send the message again).
 */
export const SMTP_TIMEOUTS_MS = { connection: 10_000, greeting: 10_000, socket: 20_000, dns: 10_000 } as const;
/** Messages one worker claims at a time. */
const CLAIM_BATCH = 20;

export function createSmtpTransport(
  config: Pick<Config, 'SMTP_HOST' | 'SMTP_PORT' | 'SMTP_SECURE' | 'SMTP_USER' | 'SMTP_PASSWORD'>,
): Transporter {
  return nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE,
    // The local fake speaks plain SMTP; a real relay with STARTTLS sets SMTP_SECURE or upgrades.
    ignoreTLS: !config.SMTP_SECURE && !config.SMTP_USER,
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASSWORD ?? '' } : undefined,
    connectionTimeout: SMTP_TIMEOUTS_MS.connection,
    greetingTimeout: SMTP_TIMEOUTS_MS.greeting,
    socketTimeout: SMTP_TIMEOUTS_MS.socket,
    dnsTimeout: SMTP_TIMEOUTS_MS.dns,
  });
}

/** Exponential back-off: 30 s, 1 min, 2 min … capped at one hour. */
export function retryDelayS(attempt: number): number {
  return Math.min(3600, 30 * 2 ** Math.max(0, attempt - 1));
}

export interface MailDelivery {
  from: string;
  /** Opens the sealed links of invitation and reset messages (SESSION_SECRET). */
  secret: string;
  /** Claim length, s (MAIL_CLAIM_S unless a test shortens it). */
  claimS?: number;
}

/**
 * Sends what is due once; returns how many messages were sent. Each message's claim is renewed
 * just before it is sent and every third of the claim while the relay is busy with it, so a slow
 * relay never lets another worker take (and send again) a message this one is sending; a message
 * whose claim was lost meanwhile is left to the worker that holds it.
 */
export async function deliverDueMail(db: Database, transport: Transporter, delivery: MailDelivery): Promise<number> {
  const claimS = delivery.claimS ?? MAIL_CLAIM_S;
  const claim = await claimDueMail(db, CLAIM_BATCH, claimS);
  let sent = 0;
  for (const message of claim.messages) {
    if (!(await extendClaim(db, message.id, claim.token, claimS, true))) continue;
    const attempt = message.attempts + 1;
    const renewal = setInterval(
      () => {
        // A failed renewal (database gone) is retried at the next interval; the claim itself says
        // whether this worker still holds the message when the outcome is recorded.
        extendClaim(db, message.id, claim.token, claimS).catch(() => undefined);
      },
      (claimS * 1000) / 3,
    );
    try {
      const text = await messageText(message, delivery.secret);
      if (text === null) {
        await markAttemptFailed(
          db,
          message.id,
          claim.token,
          'The link in this message could not be opened (SESSION_SECRET changed since it was queued); send a new one',
          null,
        );
        continue;
      }
      await transport.sendMail({ from: delivery.from, to: message.toAddress, subject: message.subject, text });
      await markSent(db, message.id, claim.token);
      sent += 1;
    } catch (error) {
      // SMTP down, refusing or silent past its time limit: keep the message and try again later.
      const reason = error instanceof Error ? error.message : String(error);
      const retryAt = attempt >= MAX_MAIL_ATTEMPTS ? null : new Date(Date.now() + retryDelayS(attempt) * 1000);
      await markAttemptFailed(db, message.id, claim.token, reason, retryAt);
    } finally {
      clearInterval(renewal);
    }
  }
  return sent;
}

/** The text to send: the stored body with its sealed link, if any, put back in. */
async function messageText(message: OutboxRow, secret: string): Promise<string | null> {
  if (!message.sealedLink) return message.textBody;
  const link = await openSealedLink(secret, message.sealedLink);
  return link === null ? null : message.textBody.replace(MAIL_LINK_PLACEHOLDER, link);
}

/** Polls the outbox until stopped. */
export function startMailWorker(db: Database, transport: Transporter, delivery: MailDelivery, intervalMs = 1000) {
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  const tick = async () => {
    try {
      await deliverDueMail(db, transport, delivery);
    } catch (error) {
      // A database hiccup must not kill the worker; the next tick tries again.
      console.error('[mail] outbox delivery failed:', error instanceof Error ? error.message : error);
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
