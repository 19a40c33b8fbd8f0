import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, resource, signal } from '@angular/core';
import { DatePipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { REVIEW_STATE_LABELS, currentRisk, type AuditEvent, type ReviewDetail, type ReviewItem } from '@shared/domain/reviews';
import { DistanceChart, type ChartBand, type ChartSeries } from '../charts/distance-chart';
import { DescentSafety } from '../descents/descent-safety';
import { Session } from '../core/session';
import { TerrainMap, type MapOverlay, type MapPosition } from '../map/terrain-map';
import { AdviceCautions } from '../ui/advice-cautions';
import { EngineeringCaution } from '../ui/engineering-caution';
import { RiskChip } from '../ui/risk-chip';
import { RISK_STYLES, riskRank } from '@shared/presentation/index';
import { brakeRiskBands } from '../charts/risk-bands';
import { ReachedTemperaturePipe } from '../units/reached-temperature-pipe';
import { QuantityPipe } from '../units/quantity-pipe';
import { toDisplay, unitLabel } from '../units/unit-format';
import { UnitPreference } from '../units/unit-preference';
import { AuditTrail } from './audit-trail';
import { describeMitigation } from './audit-details';
import { describeDescentAdvice } from './descent-advice';
import { ReviewActions } from './review-actions';
import { DIRECTION_LABELS } from './direction-labels';
import { ReviewStateChip } from './review-state-chip';
import { ReviewsApi } from './reviews-api';
import { descentCardsUrl } from '../scenarios/scenarios-api';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';

/** One descent under review: where it is, how hot the brakes get, what to do, and who did what. */
@Component({
  selector: 'app-review-detail',
  imports: [
    DatePipe,
    ReachedTemperaturePipe,
    RouterLink,
    MatButtonModule,
    MatIconModule,
    TerrainMap,
    LoadStatus,
    DistanceChart,
    EngineeringCaution,
    AdviceCautions,
    DescentSafety,
    RiskChip,
    ReviewStateChip,
    ReviewActions,
    AuditTrail,
    QuantityPipe,
  ],
  templateUrl: './review-detail.html',
  styleUrl: './review-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ReviewDetailPage {
  private readonly reviewsApi = inject(ReviewsApi);
  private readonly session = inject(Session);
  private readonly snackBar = inject(MatSnackBar);

  /** From the `:reviewId` route parameter (withComponentInputBinding). */
  readonly reviewId = input.required<string>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly riskStyles = RISK_STYLES;
  protected readonly stateLabels = REVIEW_STATE_LABELS;
  protected readonly directionLabels = DIRECTION_LABELS;
  protected readonly canAct = computed(() => this.session.can('reviews.act'));

  /**
   * The item, its profile and its history, asked for by review id: a new id drops the earlier
   * answer. Expected failures: unknown id (404), server unreachable, or an answer that fails the
   * shared schema.
   */
  protected readonly data = resource({
    params: () => ({ reviewId: this.reviewId() }),
    loader: async ({ params }): Promise<{ detail: ReviewDetail; events: AuditEvent[] }> => {
      const [detail, events] = await Promise.all([this.reviewsApi.get(params.reviewId), this.reviewsApi.events(params.reviewId)]);
      return { detail, events };
    },
  });
  protected readonly loadState = loadStateOf(this.data);
  protected readonly detail = computed<ReviewDetail | null>(() => (this.data.hasValue() ? this.data.value().detail : null));
  /** The loaded item, then the one each saved transition answers with. */
  protected readonly item = linkedSignal<ReviewItem | null>(() => this.detail()?.item ?? null);
  protected readonly events = linkedSignal<AuditEvent[]>(() => (this.data.hasValue() ? this.data.value().events : []));
  /** What the last mitigation re-run said, when it could not give a new risk (e.g. a restriction only). */
  /** Why a requested re-run could not happen; cleared whenever the item is loaded again. */
  protected readonly rerunNote = linkedSignal<ReviewDetail | null, string | null>({ source: this.detail, computation: () => null });
  protected readonly cursorX = signal<number | null>(null);

  protected readonly advice = computed(() => {
    const item = this.item();
    return item ? describeDescentAdvice(item, this.units()) : null;
  });
  protected readonly mitigationLines = computed(() => {
    const mitigation = this.item()?.mitigation;
    return mitigation ? describeMitigation(mitigation) : [];
  });
  /** The printable card of this descent, from the scenario the item shows. */
  protected readonly cardUrl = computed(() => {
    const item = this.item();
    if (!item) return '';
    // Review items are kept per travelled direction; a round trip has no single card.
    const direction = item.direction === 'inbound' ? 'inbound' : 'outbound';
    return descentCardsUrl(item.scenarioId, { direction, atM: (item.startM + item.endM) / 2 });
  });
  /** The risk that stands now: after a mitigation's re-run, that run's (see currentRisk). */
  protected readonly risk = computed(() => {
    const item = this.item();
    return item ? currentRisk(item) : 'low';
  });
  protected readonly rerunImproved = computed(() => {
    const item = this.item();
    if (!item?.mitigatedRisk) return null;
    return riskRank(item.mitigatedRisk) < riskRank(item.risk);
  });

  protected readonly mapLine = computed<readonly MapPosition[]>(() => {
    const geometry = this.detail()?.geometry;
    return geometry ? geometry.coordinates.map(([lon, lat]) => [lon, lat] as const) : [];
  });
  protected readonly overlays = computed<MapOverlay[]>(() => {
    const line = this.mapLine();
    const item = this.item();
    if (line.length < 2 || !item) return [];
    const color = RISK_STYLES[item.risk].accent;
    return [
      { kind: 'line', id: 'casing', positions: line, color: '#ffffff', weight: 10, opacity: 0.9 },
      { kind: 'line', id: 'descent', positions: line, color, weight: 6, label: `Descent on ${item.routeName}` },
      { kind: 'pin', id: 'top', at: line[0]!, color: '#0b5567', label: 'Top of the descent' },
      { kind: 'pin', id: 'bottom', at: line[line.length - 1]!, color: color, label: 'Bottom of the descent' },
    ];
  });
  protected readonly mapHighlight = computed<MapPosition | null>(() => {
    const x = this.cursorX();
    const profile = this.detail()?.profile;
    const line = this.mapLine();
    // The map line and the profile share points only when the API sends one position per sample.
    if (x === null || !profile || line.length !== profile.distanceM.length) return null;
    const index = nearestIndex(
      profile.distanceM.map((m) => toDisplay('distance', m, this.units())),
      x,
    );
    return line[index] ?? null;
  });

  protected readonly distanceLabel = computed(() => `Distance along the route (${unitLabel('distance', this.units())})`);
  protected readonly elevationLabel = computed(() => `Elevation (${unitLabel('elevation', this.units())})`);
  protected readonly temperatureLabel = computed(() => `Temperature (${unitLabel('temperature', this.units())})`);
  protected readonly elevationSeries = computed<ChartSeries[]>(() => {
    const profile = this.detail()?.profile;
    if (!profile) return [];
    const units = this.units();
    return [
      {
        label: this.elevationLabel(),
        x: profile.distanceM.map((m) => toDisplay('distance', m, units)),
        y: profile.elevationM.map((m) => toDisplay('elevation', m, units)),
        color: '#0b5567',
        fill: true,
      },
    ];
  });
  protected readonly temperatureSeries = computed<ChartSeries[]>(() => {
    const profile = this.detail()?.profile;
    const item = this.item();
    if (!profile || !item) return [];
    const units = this.units();
    const x = profile.distanceM.map((m) => toDisplay('distance', m, units));
    const fade = toDisplay('temperature', item.fadeThresholdC, units);
    return [
      {
        label: 'Brake heat model',
        x,
        y: profile.brakeTempC.map((c) => toDisplay('temperature', c, units)),
        color: '#b3261e',
      },
      {
        label: 'FHWA GSRS estimate',
        x,
        y: profile.gsrsBrakeTempC.map((c) => toDisplay('temperature', c, units)),
        color: '#5b3f8c',
        dashed: true,
      },
      {
        label: 'Fade threshold',
        x: [x[0] ?? 0, x[x.length - 1] ?? 0],
        y: [fade, fade],
        color: '#1a1c1e',
        dashed: true,
      },
    ];
  });
  protected readonly temperatureBands = computed<ChartBand[]>(() => {
    const item = this.item();
    if (!item) return [];
    return brakeRiskBands(item.fadeThresholdC, this.units());
  });

  protected applyTransition(change: { result: { item: ReviewItem; event: AuditEvent }; rerunRequested: boolean }): void {
    const { item, event } = change.result;
    this.item.set(item);
    this.events.update((events) => [...events.filter((existing) => existing.id !== event.id), event]);
    this.snackBar.open(`Saved: the item is now “${REVIEW_STATE_LABELS[item.state]}”.`, 'OK');
    // The API re-runs while answering; when it could not (nothing it can model), it says why.
    const status = event.details?.['rerunStatus'];
    this.rerunNote.set(change.rerunRequested && item.mitigatedRisk === null && typeof status === 'string' ? status : null);
  }

  protected hover(x: number | null): void {
    this.cursorX.set(x);
  }
}

function nearestIndex(values: readonly number[], target: number): number {
  let best = 0;
  for (let i = 1; i < values.length; i++) {
    if (Math.abs(values[i]! - target) < Math.abs(values[best]! - target)) best = i;
  }
  return best;
}
