import * as z from 'zod';
import { descentSchema, lineStringSchema, riskLevelSchema, speedAdviceSchema, type RiskLevel } from './analysis';
import { directionSchema } from './scenarios';
import { speedLimitKphSchema } from './limits';

/**
 * Descent review: every descent at "elevated" risk or worse in a saved scenario becomes a review
 * item, one per route stretch, direction and vehicle profile (reruns update it, never duplicate
 * it). Safety officers move items through the states below; every move is an audit event that
 * cannot be edited or deleted.
 */

export const reviewIdParamsSchema = z.object({ reviewId: z.uuid() });

/**
 * Our own state names: raised → in review → mitigated, or → awaiting sign-off → accepted (a second
 * safety officer signs off an acceptance); reopened when a rerun is worse.
 */
export const REVIEW_STATES = ['raised', 'in-review', 'mitigated', 'awaiting-sign-off', 'accepted', 'reopened'] as const;
export const reviewStateSchema = z.enum(REVIEW_STATES);
export type ReviewState = z.infer<typeof reviewStateSchema>;

export const REVIEW_STATE_LABELS: Readonly<Record<ReviewState, string>> = {
  raised: 'Raised',
  'in-review': 'In review',
  mitigated: 'Mitigated',
  'awaiting-sign-off': 'Acceptance awaiting sign-off',
  accepted: 'Risk accepted',
  reopened: 'Reopened',
};

/** What a mitigation changes. At least one measure is required. */
export const mitigationSchema = z
  .object({
    /** Lower descent speed, km/h (applied as the scenario's descent speed cap on re-run). */
    descentSpeedCapKph: speedLimitKphSchema.optional(),
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

/**
 * Whether the engine represents a measure in a re-run: a descent speed cap and an SOC ceiling
 * change its inputs; a vehicle restriction or a mandatory retarder do not. Only a re-run with a
 * modelled measure can show that a mitigation works, so only those may close an item as mitigated.
 */
export function hasModelledMeasure(mitigation: Mitigation): boolean {
  return mitigation.descentSpeedCapKph !== undefined || mitigation.socCeiling !== undefined;
}

export const reviewTransitionRequestSchema = z.discriminatedUnion('action', [
  z.object({ action: z.literal('acknowledge'), note: z.string().trim().max(2_000).optional() }),
  z.object({
    action: z.literal('mitigate'),
    mitigation: mitigationSchema,
    note: z.string().trim().max(2_000).optional(),
    /**
     * A mitigation is always re-run with the measure in place (kept for clients that send it):
     * an item is recorded as mitigated only on the strength of that re-run.
     */
    rerun: z
      .literal(true, { error: 'A mitigation is recorded only with a re-run; a measure that is not re-run goes to risk acceptance' })
      .default(true),
  }),
  /** Proposes to accept the risk as it is; a second safety officer must sign off. */
  z.object({
    action: z.literal('accept'),
    reason: z.string().trim().min(10, 'Give a reason of at least 10 characters').max(2_000),
  }),
  /** A second safety officer (not the one who proposed it) agrees to the proposed acceptance. */
  z.object({ action: z.literal('sign-off'), note: z.string().trim().max(2_000).optional() }),
  /** Sends a proposed acceptance back to review, saying why. */
  z.object({ action: z.literal('decline'), note: z.string().trim().min(3).max(2_000) }),
  z.object({ action: z.literal('reopen'), note: z.string().trim().min(3).max(2_000) }),
]);
export type ReviewTransitionRequest = z.infer<typeof reviewTransitionRequestSchema>;
export type ReviewAction = ReviewTransitionRequest['action'];

/**
 * The workflow: which states each action may leave and where it leads. Anything else is refused
 * with 409. Reruns also reopen a mitigated or accepted item on their own when the descent gets
 * worse (see the API's review sync).
 */
export const REVIEW_TRANSITIONS: Readonly<Record<ReviewAction, { from: readonly ReviewState[]; to: ReviewState }>> = {
  acknowledge: { from: ['raised', 'reopened'], to: 'in-review' },
  mitigate: { from: ['in-review'], to: 'mitigated' },
  accept: { from: ['in-review'], to: 'awaiting-sign-off' },
  'sign-off': { from: ['awaiting-sign-off'], to: 'accepted' },
  decline: { from: ['awaiting-sign-off'], to: 'in-review' },
  reopen: { from: ['mitigated', 'accepted'], to: 'reopened' },
};

/**
 * The highest risk a mitigation's re-run may leave for the item to count as mitigated. Above it,
 * the measure has not made the descent safe enough and the item stays in review (or goes to a
 * signed-off risk acceptance).
 */
export const MITIGATED_RISK_CEILING = 'elevated' as const satisfies RiskLevel;

/**
 * The risk that governs a descent: its worst credible case's where the result carries one, the
 * nominal run's otherwise. Review decisions (a mitigation's re-run) are judged on it.
 */
export function governingRisk(descent: { risk: RiskLevel; worstCase?: { risk: RiskLevel } | null }): RiskLevel {
  return descent.worstCase?.risk ?? descent.risk;
}

/** Actions open to a safety officer on an item in `state` (for the screens' buttons). */
export function allowedReviewActions(state: ReviewState): ReviewAction[] {
  return (Object.keys(REVIEW_TRANSITIONS) as ReviewAction[]).filter((action) => REVIEW_TRANSITIONS[action].from.includes(state));
}

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
  /**
   * Risk and peak brake temperature of the descent when the scenario was re-run with the
   * mitigation applied (the scenario itself keeps its own inputs); null until a mitigated re-run.
   */
  mitigatedRisk: riskLevelSchema.nullable(),
  mitigatedPeakBrakeTempC: z.number().nullable(),
  acceptanceReason: z.string().nullable(),
  /** Who proposed accepting the risk, and when (null when no acceptance is proposed or standing). */
  acceptanceProposedById: z.uuid().nullable(),
  acceptanceProposedByName: z.string().nullable(),
  acceptanceProposedAt: z.iso.datetime({ offset: true }).nullable(),
  /** The second safety officer who signed the acceptance off, and when. */
  acceptanceSignedOffByName: z.string().nullable(),
  acceptanceSignedOffAt: z.iso.datetime({ offset: true }).nullable(),
  raisedAt: z.iso.datetime({ offset: true }),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type ReviewItem = z.infer<typeof reviewItemSchema>;

/**
 * The risk that stands for an item now: the one its recorded mitigation's re-run gave, when there
 * is one, otherwise the scenario's own. A descent mitigated from critical to elevated is elevated.
 */
export function currentRisk(item: Pick<ReviewItem, 'risk' | 'mitigatedRisk' | 'state'>): ReviewItem['risk'] {
  return item.state === 'mitigated' && item.mitigatedRisk ? item.mitigatedRisk : item.risk;
}
export const reviewListSchema = z.object({ items: z.array(reviewItemSchema), caution: z.string() });

/**
 * States in which an item still needs a safety officer (counted as "open"); a proposed acceptance
 * stays open until a second safety officer signs it off.
 */
export const OPEN_REVIEW_STATES = ['raised', 'in-review', 'awaiting-sign-off', 'reopened'] as const satisfies readonly ReviewState[];

/** GET /api/reviews filters; each one narrows the list. */
export const reviewListQuerySchema = z.object({
  risk: riskLevelSchema.optional(),
  state: reviewStateSchema.optional(),
  routeId: z.uuid().optional(),
  vehicleProfileId: z.uuid().optional(),
});
export type ReviewListQuery = z.infer<typeof reviewListQuerySchema>;

/** The descent's stretch of the stored profile, for the review chart (equal-length arrays). */
export const reviewProfileSliceSchema = z.object({
  distanceM: z.array(z.number()),
  elevationM: z.array(z.number()),
  brakeTempC: z.array(z.number()),
  gsrsBrakeTempC: z.array(z.number()),
  speedMps: z.array(z.number()),
});
export type ReviewProfileSlice = z.infer<typeof reviewProfileSliceSchema>;

/** GET /api/reviews/:reviewId: the item, its chart data and the map line of the descent. */
export const reviewDetailSchema = z.object({
  item: reviewItemSchema,
  /** null when the scenario's stored result is gone (deleted or not yet re-run). */
  profile: reviewProfileSliceSchema.nullable(),
  /** The descent's stretch of the route, WGS 84; null when no stored profile has positions. */
  geometry: lineStringSchema.nullable(),
  /** The descent as the latest run found it: its worst case, sensitivity, drivability and adhesion. */
  descent: descentSchema.optional(),
  caution: z.string(),
});
export type ReviewDetail = z.infer<typeof reviewDetailSchema>;

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

/** POST /api/reviews/:reviewId/transitions answer: the item after the move and the event written. */
export const reviewTransitionResultSchema = z.object({
  item: reviewItemSchema,
  event: auditEventSchema,
  caution: z.string(),
});
export type ReviewTransitionResult = z.infer<typeof reviewTransitionResultSchema>;

/** E-mail notifications a person can switch off. */
export const notificationSettingsSchema = z.object({
  /** Safety officers: a new high or critical descent needs review. */
  newHighRiskDescent: z.boolean().default(true),
  /** Planners: a review item on one of their scenarios was resolved. */
  reviewResolved: z.boolean().default(true),
});
export type NotificationSettings = z.infer<typeof notificationSettingsSchema>;
