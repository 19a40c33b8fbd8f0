/**
 * E-mails of the review workflow, queued through the outbox inside the transaction that makes
 * the change: safety officers hear of new high or critical descents, scenario creators hear when
 * an item on their scenario is resolved. Each person can switch either message off.
 */
import { and, eq, inArray } from 'drizzle-orm';
import type { Descent } from '@shared/domain/analysis';
import {
  DIRECTION_LABELS,
  RISK_LABELS,
  adviceCautionsText,
  describeDescentAdvice,
  describeDescentPlace,
  formatStretch,
  formatTemperatureLimit,
  formatTemperatureReached,
} from '@shared/presentation/index';
import { notificationSettingsSchema, REVIEW_STATE_LABELS, type NotificationSettings } from '@shared/domain/reviews';
import type { Executor } from '../db/client';
import { users, type ReviewItemRow } from '../db/schema/index';
import { enqueueMail } from '../mail/outbox';

/** A person's switches, with the defaults (on) for keys never set. */
export function notificationSettingsOf(stored: Record<string, boolean> | null | undefined): NotificationSettings {
  return notificationSettingsSchema.parse(stored ?? {});
}

export function reviewLink(publicUrl: string, reviewId: string): string {
  return `${publicUrl.replace(/\/+$/, '')}/reviews/${reviewId}`;
}

/**
 * The descent in words and figures, as both e-mails show it: the same labels, units and safety
 * rounding as the screens and the PDF report (shared/presentation). Mail goes out in metric units.
 */
export function describeDescent(
  item: Pick<ReviewItemRow, 'routeName' | 'direction' | 'vehicleProfileName' | 'scenarioName'>,
  descent: Descent,
): string[] {
  return [
    `Route: ${item.routeName} (${DIRECTION_LABELS[item.direction].toLowerCase()})`,
    `Vehicle profile: ${item.vehicleProfileName}; scenario: ${item.scenarioName}`,
    `Descent: ${describeDescentPlace(descent, MAIL_UNITS)}`,
    `Risk: ${RISK_LABELS[descent.risk]}; peak brake temperature ${formatTemperatureReached(descent.peakBrakeTempC, MAIL_UNITS)} ` +
      `(fade threshold ${formatTemperatureLimit(descent.fadeThresholdC, MAIL_UNITS)}; grade-severity estimate ` +
      `${formatTemperatureReached(descent.gsrsPeakBrakeTempC, MAIL_UNITS)})`,
    `Advice: ${describeDescentAdvice(descent, MAIL_UNITS).short}`,
  ];
}

/** Active safety officers who want to hear of new high-risk descents. */
async function safetyRecipients(tx: Executor) {
  const rows = await tx
    .select({ email: users.email, name: users.name, notificationSettings: users.notificationSettings })
    .from(users)
    .where(and(eq(users.role, 'safety'), eq(users.status, 'active')));
  return rows.filter((row) => notificationSettingsOf(row.notificationSettings).newHighRiskDescent);
}

/** Tells every safety officer (who has not opted out) that a high or critical descent needs review. */
export async function notifyHighRiskDescent(
  tx: Executor,
  publicUrl: string,
  item: ReviewItemRow,
  reason: 'new' | 'reopened',
): Promise<void> {
  const recipients = await safetyRecipients(tx);
  const headline =
    reason === 'new'
      ? `A scenario run found a new ${RISK_LABELS[item.risk].toLowerCase()}-risk descent that needs review.`
      : `A scenario rerun made a resolved descent worse (now ${RISK_LABELS[item.risk].toLowerCase()} risk); the review item is reopened.`;
  for (const recipient of recipients) {
    await enqueueMail(tx, {
      to: recipient.email,
      subject: `${RISK_LABELS[item.risk]}-risk descent on ${item.routeName}: ${stretch(item.descent)}`,
      textBody: [
        `Hello ${recipient.name},`,
        '',
        headline,
        '',
        ...describeDescent(item, item.descent),
        '',
        'Review it here:',
        reviewLink(publicUrl, item.id),
        '',
        adviceCautionsText(),
        '',
        'You receive this because you are a safety officer; switch it off under your notification settings.',
      ].join('\n'),
    });
  }
}

/** Tells the creators of the item's scenarios (who have not opted out) that it was resolved. */
export async function notifyReviewResolved(
  tx: Executor,
  publicUrl: string,
  item: ReviewItemRow,
  resolution: { by: string; text: string },
): Promise<void> {
  const creatorIds = [...new Set(Object.values(item.sources).map((source) => source.createdById))].filter(
    (id): id is string => id !== null,
  );
  if (creatorIds.length === 0) return;
  const recipients = await tx
    .select({ email: users.email, name: users.name, notificationSettings: users.notificationSettings })
    .from(users)
    .where(and(inArray(users.id, creatorIds), eq(users.status, 'active')));
  for (const recipient of recipients) {
    if (!notificationSettingsOf(recipient.notificationSettings).reviewResolved) continue;
    await enqueueMail(tx, {
      to: recipient.email,
      subject: `Descent review ${REVIEW_STATE_LABELS[item.state].toLowerCase()}: ${item.routeName}, ${stretch(item.descent)}`,
      textBody: [
        `Hello ${recipient.name},`,
        '',
        `${resolution.by} resolved a descent review item on your scenario: ${REVIEW_STATE_LABELS[item.state].toLowerCase()}.`,
        resolution.text,
        '',
        ...describeDescent(item, item.descent),
        '',
        'Details and audit trail:',
        reviewLink(publicUrl, item.id),
        '',
        adviceCautionsText(),
        '',
        'You receive this because you created the scenario; switch it off under your notification settings.',
      ].join('\n'),
    });
  }
}

/** E-mails have no unit switch: metric, as the authority's own documents. */
const MAIL_UNITS = 'metric';

function stretch(descent: Pick<Descent, 'startM' | 'endM'>): string {
  return formatStretch(descent.startM, descent.endM, MAIL_UNITS);
}
