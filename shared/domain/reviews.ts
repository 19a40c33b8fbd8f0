import { z } from 'zod';
import { riskLevelSchema, speedAdviceSchema } from './analysis';
import { directionSchema } from './scenarios';

/**
 * Descent review: every descent at "elevated" risk or worse in a saved scenario becomes a review
 * item, one per route stretch, direction and vehicle profile (reruns update it, never duplicate
 * it). Safety officers move items through the states below; every move is an audit event that
 * cannot be edited or deleted.
 */

export const reviewIdParamsSchema = z.object({ reviewId: z.uuid() });

/** Our own state names: raised → in review → mitigated | accepted; reopened when a rerun is worse. */
export const REVIEW_STATES = ['raised', 'in-review', 'mitigated', 'accepted', 'reopened'] as const;
export const reviewStateSchema = z.enum(REVIEW_STATES);
export type ReviewState = z.infer<typeof reviewStateSchema>;

export const REVIEW_STATE_LABELS: Readonly<Record<ReviewState, string>> = {
  raised: 'Raised',
  'in-review': 'In review',
  mitigated: 'Mitigated',
  accepted: 'Risk accepted',
  reopened: 'Reopened',
};

/** What a mitigation changes. At least one measure is required. */
export const mitigationSchema = z
  .object({
    /** Lower descent speed, km/h (applied as the scenario's descent speed cap on re-run). */
    descentSpeedCapKph: z.number().min(5).max(130).optional(),
    /** Highest SOC at the depot / top of the descent, 0–1 (applied as the scenario's start SOC cap). */
    socCeiling: z.number().min(0.05).max(1).optional(),
    /** Vehicles this stretch is restricted to or from, in words. */
    vehicleRestriction: z.string().trim().max(500).optional(),
    /** Retarder / endurance brake or regeneration mode made mandatory on this descent. */
    mandatoryRetarder: z.boolean().optional(),
  })
  .refine(
    (measures) =>
      measures.descentSpeedCapKph !== undefined ||
      measures.socCeiling !== undefined ||
      Boolean(measures.vehicleRestriction) ||
      measures.mandatoryRetarder === true,
    { message: 'Name at least one measure: descent speed cap, SOC ceiling, vehicle restriction or mandatory retarder' },
  );
export type Mitigation = z.infer<typeof mitigationSchema>;

export const reviewTransitionRequestSchema = z.discriminatedUnion('action', [
  z.object({ action: z.literal('acknowledge'), note: z.string().trim().max(2_000).optional() }),
  z.object({
    action: z.literal('mitigate'),
    mitigation: mitigationSchema,
    note: z.string().trim().max(2_000).optional(),
    /** Re-run the scenario with the mitigation applied and record the new risk. */
    rerun: z.boolean().default(true),
  }),
  z.object({
    action: z.literal('accept'),
    reason: z.string().trim().min(10, 'Give a reason of at least 10 characters').max(2_000),
  }),
  z.object({ action: z.literal('reopen'), note: z.string().trim().min(3).max(2_000) }),
]);
export type ReviewTransitionRequest = z.infer<typeof reviewTransitionRequestSchema>;

export const reviewItemSchema = z.object({
  id: z.uuid(),
  state: reviewStateSchema,
  scenarioId: z.uuid(),
  scenarioName: z.string(),
  routeId: z.uuid(),
  routeName: z.string(),
  vehicleProfileId: z.uuid(),
  vehicleProfileName: z.string(),
  direction: directionSchema,
  startM: z.number(),
  endM: z.number(),
  dropM: z.number(),
  meanGradePercent: z.number(),
  maxGradePercent: z.number(),
  risk: riskLevelSchema,
  /** The risk when the item was first raised, to show the effect of mitigations. */
  raisedRisk: riskLevelSchema,
  peakBrakeTempC: z.number(),
  gsrsPeakBrakeTempC: z.number(),
  fadeThresholdC: z.number(),
  maxSafeSpeedKph: z.number().nullable(),
  speedAdvice: speedAdviceSchema,
  maxTopSoc: z.number().nullable(),
  mitigation: mitigationSchema.nullable(),
  acceptanceReason: z.string().nullable(),
  raisedAt: z.iso.datetime({ offset: true }),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type ReviewItem = z.infer<typeof reviewItemSchema>;
export const reviewListSchema = z.object({ items: z.array(reviewItemSchema) });

export const auditEventSchema = z.object({
  id: z.uuid(),
  reviewId: z.uuid(),
  actorName: z.string(),
  at: z.iso.datetime({ offset: true }),
  fromState: reviewStateSchema.nullable(),
  toState: reviewStateSchema,
  note: z.string().nullable(),
  /** What changed: mitigation measures, risk before/after a re-run, … */
  details: z.record(z.string(), z.unknown()).nullable(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;
export const auditEventListSchema = z.object({ items: z.array(auditEventSchema) });

/** E-mail notifications a person can switch off. */
export const notificationSettingsSchema = z.object({
  /** Safety officers: a new high or critical descent needs review. */
  newHighRiskDescent: z.boolean().default(true),
  /** Planners: a review item on one of their scenarios was resolved. */
  reviewResolved: z.boolean().default(true),
});
export type NotificationSettings = z.infer<typeof notificationSettingsSchema>;
