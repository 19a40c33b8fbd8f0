import type { User } from '@shared/domain/auth';
import type { Descent, RiskLevel } from '@shared/domain/analysis';
import type {
  AuditEvent,
  Mitigation,
  ReviewDetail,
  ReviewItem,
  ReviewListQuery,
  ReviewProfileSlice,
  ReviewTransitionRequest,
  ReviewTransitionResult,
} from '@shared/domain/reviews';
import { MITIGATED_RISK_CEILING, currentRisk, governingRisk, hasModelledMeasure } from '@shared/domain/reviews';
import { formatStretch } from '@shared/presentation/index';
import type { DirectionResult } from '@shared/domain/scenarios';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import type { AppDeps } from '../app-deps';
import { recordAudit } from '../audit/audit-log';
import { ForbiddenError, NotFoundError, UnprocessableError } from '../http/http-error';
import { notifyReviewResolved } from './review-notifications';
import { riskRank } from '@shared/presentation/risk-styles';
import { matchStretches, nextState } from './review-workflow';
import * as repository from './reviews-repository';
import { rerunWithMitigation, type MitigatedRerun } from './scenario-rerun';

export async function listReviews(deps: AppDeps, query: ReviewListQuery): Promise<ReviewItem[]> {
  return (await repository.listReviewItems(deps.db, query)).map(repository.toReviewItem);
}

export async function getReview(deps: AppDeps, reviewId: string): Promise<ReviewDetail> {
  const row = await repository.findReviewItem(deps.db, reviewId);
  if (!row) throw new NotFoundError('Review item');
  const results = await repository.findScenarioResult(deps.db, row.scenarioId);
  const direction = results?.find((candidate) => candidate.direction === row.direction);
  const slice = direction ? sliceProfile(direction, row.descent) : null;
  return {
    item: repository.toReviewItem(row),
    ...(slice ?? { profile: null, geometry: null }),
    descent: row.descent,
    caution: ENGINEERING_CAUTION,
  };
}

export async function listEvents(deps: AppDeps, reviewId: string): Promise<AuditEvent[]> {
  const row = await repository.findReviewItem(deps.db, reviewId);
  if (!row) throw new NotFoundError('Review item');
  return (await repository.listReviewEvents(deps.db, reviewId)).map(repository.toAuditEvent);
}

/**
 * Moves an item through the workflow and writes its audit event (and an audit-log entry) in one
 * transaction. The rules that keep danger visible:
 *
 * - a mitigation must contain a measure the engine represents (speed cap, SOC ceiling); it is
 *   re-run with the measures in place (outside the transaction: the engine takes a while), and
 *   recorded only when the re-run's governing risk (the worst case's when the result has one)
 *   is elevated or lower; otherwise 422 with the re-run's figures and nothing changes;
 * - accepting a risk is a proposal with a reason; a second safety officer, never the proposer,
 *   signs it off (or declines it back to review).
 *
 * The scenario itself keeps its own inputs and stored result.
 */
export async function transitionReview(
  deps: AppDeps,
  actor: User,
  reviewId: string,
  request: ReviewTransitionRequest,
  rerun: MitigatedRerun = rerunWithMitigation,
): Promise<ReviewTransitionResult> {
  const before = await repository.findReviewItem(deps.db, reviewId);
  if (!before) throw new NotFoundError('Review item');
  // Refuse an invalid move before spending time on a re-run.
  nextState(before.state, request.action);
  if (request.action === 'mitigate' && !hasModelledMeasure(request.mitigation)) throw measureNotModelled();
  if (request.action === 'sign-off') assertSecondOfficer(before, actor);
  const rerunOutcome = request.action === 'mitigate' ? await mitigatedRerunOutcome(deps, before, request.mitigation, rerun) : undefined;
  if (rerunOutcome && riskRank(rerunOutcome.riskAfter) > riskRank(MITIGATED_RISK_CEILING)) {
    throw new UnprocessableError(
      `With this mitigation the re-run still gives ${rerunOutcome.riskAfter} risk; an item is mitigated only when the ` +
        `re-run gives ${MITIGATED_RISK_CEILING} risk or lower. Strengthen the measure, or propose accepting the risk ` +
        'with a reason for a second safety officer to sign off.',
      'mitigation_insufficient',
      mitigationDetails((request as Extract<ReviewTransitionRequest, { action: 'mitigate' }>).mitigation, rerunOutcome),
    );
  }

  return deps.db.transaction(async (tx) => {
    const item = await repository.findReviewItem(tx, reviewId, { lock: true });
    if (!item) throw new NotFoundError('Review item');
    const toState = nextState(item.state, request.action);
    const base = { reviewId, actorId: actor.id, actorName: actor.name, fromState: item.state, toState };

    let updated;
    let event;
    switch (request.action) {
      case 'acknowledge':
        updated = await repository.updateReviewItem(tx, reviewId, { state: toState });
        event = await repository.insertReviewEvent(tx, { ...base, note: request.note ?? null, details: null });
        break;
      case 'mitigate':
        updated = await repository.updateReviewItem(tx, reviewId, {
          state: toState,
          mitigation: request.mitigation,
          mitigatedRisk: rerunOutcome!.riskAfter,
          mitigatedPeakBrakeTempC: rerunOutcome!.peakBrakeTempAfterC,
          ...NO_ACCEPTANCE,
        });
        event = await repository.insertReviewEvent(tx, {
          ...base,
          note: request.note ?? null,
          details: mitigationDetails(request.mitigation, rerunOutcome!),
        });
        await notifyReviewResolved(tx, deps.config.PUBLIC_URL, updated, {
          by: actor.name,
          text: [`Mitigation: ${describeMitigation(request.mitigation)}.`, `Re-run: ${rerunOutcome!.message}`].join('\n'),
        });
        break;
      case 'accept':
        updated = await repository.updateReviewItem(tx, reviewId, {
          state: toState,
          ...NO_ACCEPTANCE,
          acceptanceReason: request.reason,
          acceptanceProposedById: actor.id,
          acceptanceProposedByName: actor.name,
          acceptanceProposedAt: new Date(),
        });
        event = await repository.insertReviewEvent(tx, {
          ...base,
          note: request.reason,
          details: { reason: request.reason, awaiting: 'A second safety officer must sign off this acceptance' },
        });
        break;
      case 'sign-off':
        // Checked again under the lock: the proposal may have changed since the first read.
        assertSecondOfficer(item, actor);
        updated = await repository.updateReviewItem(tx, reviewId, {
          state: toState,
          acceptanceSignedOffById: actor.id,
          acceptanceSignedOffByName: actor.name,
          acceptanceSignedOffAt: new Date(),
        });
        event = await repository.insertReviewEvent(tx, {
          ...base,
          note: request.note ?? null,
          details: { reason: item.acceptanceReason, proposedBy: item.acceptanceProposedByName, signedOffBy: actor.name },
        });
        await notifyReviewResolved(tx, deps.config.PUBLIC_URL, updated, {
          by: actor.name,
          text:
            `Risk accepted, proposed by ${item.acceptanceProposedByName ?? 'a safety officer'} and signed off by ${actor.name}: ` +
            `${item.acceptanceReason ?? ''}`,
        });
        break;
      case 'decline':
        updated = await repository.updateReviewItem(tx, reviewId, { state: toState, ...NO_ACCEPTANCE });
        event = await repository.insertReviewEvent(tx, {
          ...base,
          note: request.note,
          details: { declinedReason: item.acceptanceReason, proposedBy: item.acceptanceProposedByName },
        });
        break;
      case 'reopen':
        updated = await repository.updateReviewItem(tx, reviewId, { state: toState });
        event = await repository.insertReviewEvent(tx, { ...base, note: request.note, details: null });
        break;
    }
    await recordAudit(tx, actor, {
      action: 'review-decision',
      kind: 'review-item',
      entityId: reviewId,
      entityName: `${updated.routeName}, ${formatStretch(updated.startM, updated.endM, 'metric')}`,
      details: {
        move: request.action,
        fromState: item.state,
        toState,
        risk: currentRisk(repository.toReviewItem(updated)),
        note: event.note ?? null,
      },
    });
    return { item: repository.toReviewItem(updated), event: repository.toAuditEvent(event), caution: ENGINEERING_CAUTION };
  });
}

/** Clears a proposed or signed-off acceptance (a mitigation or a decline replaces it). */
const NO_ACCEPTANCE = {
  acceptanceReason: null,
  acceptanceProposedById: null,
  acceptanceProposedByName: null,
  acceptanceProposedAt: null,
  acceptanceSignedOffById: null,
  acceptanceSignedOffByName: null,
  acceptanceSignedOffAt: null,
} as const;

function measureNotModelled(): UnprocessableError {
  return new UnprocessableError(
    'A vehicle restriction or a mandatory retarder is not represented by the model, so a re-run cannot show that it ' +
      'makes the descent safe. Add a descent speed cap or an SOC ceiling to re-run with, or propose accepting the risk ' +
      'with a reason for a second safety officer to sign off.',
    'measure_not_modelled',
  );
}

/** A risk acceptance needs two people: the proposer cannot sign it off. */
function assertSecondOfficer(item: { acceptanceProposedById: string | null }, actor: User): void {
  if (item.acceptanceProposedById === actor.id) {
    throw new ForbiddenError('You proposed this acceptance; a second safety officer must sign it off', 'second_officer_required');
  }
}

export interface RerunOutcome {
  scenarioId: string;
  /** Measures the engine applied; the others (restriction, retarder) are recorded, not modelled. */
  applied: { descentSpeedCapKph?: number; startSocCeiling?: number };
  /** Governing risks (the worst case's where the result has one) before and after. */
  riskBefore: RiskLevel;
  riskAfter: RiskLevel;
  peakBrakeTempBeforeC: number;
  peakBrakeTempAfterC: number | null;
  maxSafeSpeedAfterKph: number | null;
  /** Whether the mitigated re-run brings the descent below "elevated". */
  belowElevated: boolean;
  message: string;
}

async function mitigatedRerunOutcome(
  deps: AppDeps,
  item: NonNullable<Awaited<ReturnType<typeof repository.findReviewItem>>>,
  mitigation: Mitigation,
  rerun: MitigatedRerun,
): Promise<RerunOutcome> {
  const applied = {
    ...(mitigation.descentSpeedCapKph !== undefined ? { descentSpeedCapKph: mitigation.descentSpeedCapKph } : {}),
    ...(mitigation.socCeiling !== undefined ? { startSocCeiling: mitigation.socCeiling } : {}),
  };
  if (Object.keys(applied).length === 0) throw measureNotModelled();
  const directions = await rerun(deps, item.scenarioId, applied);
  const direction = directions.find((candidate) => candidate.direction === item.direction);
  const [index] = matchStretches([item.descent], direction?.descents ?? []);
  const after: Descent | undefined = index !== undefined && index >= 0 ? direction!.descents[index] : undefined;
  const base = {
    scenarioId: item.scenarioId,
    applied,
    riskBefore: governingRisk(item.descent),
    peakBrakeTempBeforeC: item.peakBrakeTempC,
  };
  if (!after) {
    return {
      ...base,
      riskAfter: 'low',
      peakBrakeTempAfterC: null,
      maxSafeSpeedAfterKph: null,
      belowElevated: true,
      message: 'With the mitigation the stretch no longer shows as a descent; the risk is below elevated',
    };
  }
  const riskAfter = governingRisk(after);
  const belowElevated = riskRank(riskAfter) < riskRank('elevated');
  return {
    ...base,
    riskAfter,
    peakBrakeTempAfterC: after.peakBrakeTempC,
    maxSafeSpeedAfterKph: after.maxSafeSpeedKph,
    belowElevated,
    message:
      `Risk ${base.riskBefore} → ${riskAfter}; peak brake temperature ${Math.round(item.peakBrakeTempC)} °C → ${Math.round(after.peakBrakeTempC)} °C. ` +
      (belowElevated ? 'The mitigation brings the risk below elevated.' : 'The risk stays at elevated or above.'),
  };
}

/** Flat keys, so the audit trail reads as labelled lines (risk before/after, temperatures). */
function mitigationDetails(mitigation: Mitigation, outcome: RerunOutcome): Record<string, unknown> {
  return {
    mitigation,
    rerun: true,
    rerunStatus: outcome.message,
    scenarioId: outcome.scenarioId,
    riskBefore: outcome.riskBefore,
    riskAfter: outcome.riskAfter,
    previousPeakBrakeTempC: outcome.peakBrakeTempBeforeC,
    mitigatedPeakBrakeTempC: outcome.peakBrakeTempAfterC,
    maxSafeSpeedAfterKph: outcome.maxSafeSpeedAfterKph,
    belowElevated: outcome.belowElevated,
  };
}

function describeMitigation(mitigation: Mitigation): string {
  const parts: string[] = [];
  if (mitigation.descentSpeedCapKph !== undefined) parts.push(`descent speed cap ${mitigation.descentSpeedCapKph} km/h`);
  if (mitigation.socCeiling !== undefined) parts.push(`SOC ceiling at the depot ${Math.round(mitigation.socCeiling * 100)} %`);
  if (mitigation.vehicleRestriction) parts.push(`vehicle restriction: ${mitigation.vehicleRestriction}`);
  if (mitigation.mandatoryRetarder) parts.push('retarder / endurance braking mandatory');
  return parts.join('; ');
}

/** The descent's stretch of the stored profile (chart) and of the route line (map). */
function sliceProfile(
  direction: DirectionResult,
  descent: Descent,
): { profile: ReviewProfileSlice; geometry: ReviewDetail['geometry'] } | null {
  const { profile } = direction;
  const indices: number[] = [];
  profile.distanceM.forEach((distanceM, index) => {
    if (distanceM >= descent.startM && distanceM <= descent.endM) indices.push(index);
  });
  if (indices.length === 0) return null;
  const pick = (values: number[]) => indices.map((index) => values[index] ?? 0);
  const hasPositions = profile.lon.length === profile.distanceM.length && indices.length >= 2;
  return {
    profile: {
      distanceM: pick(profile.distanceM),
      elevationM: pick(profile.elevationM),
      brakeTempC: pick(profile.brakeTempC),
      gsrsBrakeTempC: pick(profile.gsrsBrakeTempC),
      speedMps: pick(profile.speedMps),
    },
    geometry: hasPositions
      ? { type: 'LineString', coordinates: indices.map((index) => [profile.lon[index]!, profile.lat[index]!] as [number, number]) }
      : null,
  };
}
