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
import type { DirectionResult } from '@shared/domain/scenarios';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import type { AppDeps } from '../app-deps';
import { NotFoundError } from '../http/http-error';
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
  return { item: repository.toReviewItem(row), ...(slice ?? { profile: null, geometry: null }), caution: ENGINEERING_CAUTION };
}

export async function listEvents(deps: AppDeps, reviewId: string): Promise<AuditEvent[]> {
  const row = await repository.findReviewItem(deps.db, reviewId);
  if (!row) throw new NotFoundError('Review item');
  return (await repository.listReviewEvents(deps.db, reviewId)).map(repository.toAuditEvent);
}

/**
 * Moves an item through the workflow and writes its audit event in one transaction. A
 * mitigation first re-runs the scenario with the measures applied (outside the transaction: the
 * engine takes a while) and records the risk before and after; the scenario itself keeps its own
 * inputs and stored result.
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
  const rerunOutcome =
    request.action === 'mitigate' && request.rerun
      ? await mitigatedRerunOutcome(deps, before, request.mitigation, rerun)
      : undefined;

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
          mitigatedRisk: rerunOutcome?.riskAfter ?? null,
          mitigatedPeakBrakeTempC: rerunOutcome?.peakBrakeTempAfterC ?? null,
          acceptanceReason: null,
        });
        event = await repository.insertReviewEvent(tx, {
          ...base,
          note: request.note ?? null,
          details: mitigationDetails(request.mitigation, request.rerun, rerunOutcome),
        });
        await notifyReviewResolved(tx, deps.config.PUBLIC_URL, updated, {
          by: actor.name,
          text: [
            `Mitigation: ${describeMitigation(request.mitigation)}.`,
            rerunOutcome?.message ? `Re-run: ${rerunOutcome.message}` : '',
          ]
            .filter(Boolean)
            .join('\n'),
        });
        break;
      case 'accept':
        updated = await repository.updateReviewItem(tx, reviewId, { state: toState, acceptanceReason: request.reason });
        event = await repository.insertReviewEvent(tx, { ...base, note: request.reason, details: { reason: request.reason } });
        await notifyReviewResolved(tx, deps.config.PUBLIC_URL, updated, { by: actor.name, text: `Risk accepted: ${request.reason}` });
        break;
      case 'reopen':
        updated = await repository.updateReviewItem(tx, reviewId, { state: toState });
        event = await repository.insertReviewEvent(tx, { ...base, note: request.note, details: null });
        break;
    }
    return { item: repository.toReviewItem(updated), event: repository.toAuditEvent(event), caution: ENGINEERING_CAUTION };
  });
}

export interface RerunOutcome {
  performed: boolean;
  scenarioId?: string;
  /** Measures the engine applied; the others (restriction, retarder) are recorded, not modelled. */
  applied?: { descentSpeedCapKph?: number; startSocCeiling?: number };
  riskBefore?: RiskLevel;
  riskAfter?: RiskLevel | null;
  peakBrakeTempBeforeC?: number;
  peakBrakeTempAfterC?: number | null;
  maxSafeSpeedAfterKph?: number | null;
  /** Whether the mitigated re-run brings the descent below "elevated". */
  belowElevated?: boolean;
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
  if (Object.keys(applied).length === 0) {
    return {
      performed: false,
      message: 'Not re-run: a vehicle restriction or a mandatory retarder is not modelled by the scenario; the measure is recorded as given',
    };
  }
  const directions = await rerun(deps, item.scenarioId, applied);
  const direction = directions.find((candidate) => candidate.direction === item.direction);
  const [index] = matchStretches([item.descent], direction?.descents ?? []);
  const after: Descent | undefined = index !== undefined && index >= 0 ? direction!.descents[index] : undefined;
  const base = {
    performed: true,
    scenarioId: item.scenarioId,
    applied,
    riskBefore: item.risk,
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
  const belowElevated = riskRank(after.risk) < riskRank('elevated');
  return {
    ...base,
    riskAfter: after.risk,
    peakBrakeTempAfterC: after.peakBrakeTempC,
    maxSafeSpeedAfterKph: after.maxSafeSpeedKph,
    belowElevated,
    message:
      `Risk ${item.risk} → ${after.risk}; peak brake temperature ${Math.round(item.peakBrakeTempC)} °C → ${Math.round(after.peakBrakeTempC)} °C. ` +
      (belowElevated ? 'The mitigation brings the risk below elevated.' : 'The risk stays at elevated or above.'),
  };
}

/** Flat keys, so the audit trail reads as labelled lines (risk before/after, temperatures). */
function mitigationDetails(mitigation: Mitigation, rerunRequested: boolean, outcome: RerunOutcome | undefined): Record<string, unknown> {
  if (!outcome) return { mitigation, rerun: rerunRequested, rerunStatus: 'Not re-run: the safety officer asked for no re-run' };
  return {
    mitigation,
    rerun: rerunRequested,
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
function sliceProfile(direction: DirectionResult, descent: Descent): { profile: ReviewProfileSlice; geometry: ReviewDetail['geometry'] } | null {
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
