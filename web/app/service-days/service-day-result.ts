import { DatePipe, PercentPipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import type { ServiceDay, ServiceDayResult } from '@shared/domain/service-days';
import {
  BATTERY_AGE_LABELS,
  blockVehicleSentence,
  CHARGING_PURPOSE_LABELS,
  DAY_TYPE_LABELS,
  DIRECTION_LABELS,
  SCENARIO_STATUS_LABELS,
  SEASON_LABELS,
  SERVICE_DAY_NOT_COVERED,
  formatServiceTime,
  formatTemperatureReached,
  riskRank,
} from '@shared/presentation/index';
import { DistanceChart } from '../charts/distance-chart';
import { apiErrorBody, describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { AdviceCautions } from '../ui/advice-cautions';
import { staleSentence } from '../ui/stale-reasons';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';
import { latestAnswer, reloadWhileGoing, storedResult } from '../ui/polled-resource';
import { confirmDelete } from '../ui/confirm-delete-dialog';
import { RiskChip } from '../ui/risk-chip';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { orderBlocks, socChartSeries, worsenedDescents } from './service-day-series';
import { ServiceDayTimeline } from './service-day-timeline';
import { timelineRows } from './service-day-timeline-model';
import { ServiceDaysApi, type ServiceDayExportKind } from './service-days-api';
import { RoadRoutesApi } from '../road-routes/road-routes-api';
import type { RoadRouteSummary } from '@shared/domain/road-routes';

/** How often a queued or running service day is asked for its status, ms. */
const POLL_INTERVAL_MS = 1_500;

const isGoing = (day: ServiceDay) => day.status === 'queued' || day.status === 'running';

/**
 * One service day's run: SOC through the day for every block on one chart with the reserve,
 * the blocks that cannot be worked first with their reasons, charging per block, the descents
 * the day made riskier (with the cautions beside them) and the peak power of each charger site.
 */
@Component({
  selector: 'app-service-day-result',
  imports: [
    AdviceCautions,
    DatePipe,
    PercentPipe,
    RouterLink,
    MatButtonModule,
    MatIconModule,
    MatMenuModule,
    MatProgressBarModule,
    DistanceChart,
    LoadStatus,
    QuantityPipe,
    RiskChip,
    ServiceDayTimeline,
    UnitSwitch,
  ],
  templateUrl: './service-day-result.html',
  styleUrl: './service-day-result.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ServiceDayResultScreen {
  private readonly api = inject(ServiceDaysApi);
  private readonly routesApi = inject(RoadRoutesApi);
  private readonly session = inject(Session);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);

  /** From `service-days/:serviceDayId`. */
  readonly serviceDayId = input.required<string>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly staleSentence = staleSentence;
  protected readonly dayTypeLabels = DAY_TYPE_LABELS;
  protected readonly seasonLabels = SEASON_LABELS;
  protected readonly batteryAgeLabels = BATTERY_AGE_LABELS;
  protected readonly statusLabels = SCENARIO_STATUS_LABELS;
  protected readonly purposeLabels = CHARGING_PURPOSE_LABELS;
  protected readonly directionLabels = DIRECTION_LABELS;
  protected readonly notCovered = SERVICE_DAY_NOT_COVERED;

  /**
   * The service day, asked for by id: a new id drops the earlier answer, and a queued or running
   * day is asked for again (`reload`) until it settles. Expected failures: unknown id (404), server
   * unreachable, an answer that fails the shared schema.
   */
  protected readonly data = resource({
    params: () => ({ serviceDayId: this.serviceDayId() }),
    loader: ({ params }) => this.api.get(params.serviceDayId),
  });
  protected readonly loadState = loadStateOf(this.data);
  /** The last answer for the current id: kept while a poll reloads or fails, replaced by the answer to "Run", dropped on a new id. */
  protected readonly day = latestAnswer(this.serviceDayId, this.data);
  /** The stored result, asked for again only when the day was computed again; null: none stored. */
  private readonly stored = storedResult(this.serviceDayId, this.day, async (jobId): Promise<ServiceDayResult | null> => {
    try {
      return await this.api.result(jobId);
    } catch (error: unknown) {
      // Not stored (404) or its first run still going (409): the page says so without an error.
      // An unknown day (`not_found`) is an error.
      if (
        error instanceof HttpErrorResponse &&
        (error.status === 404 || error.status === 409) &&
        apiErrorBody(error)?.code !== 'not_found'
      ) {
        return null;
      }
      throw error;
    }
  });
  protected readonly resultData = this.stored.data;
  private readonly shownResult = this.stored.shown;
  protected readonly resultState = this.stored.state;
  protected readonly resultLoadState = this.stored.loadState;
  /** What failed after the page was shown: an action (Run, Delete) or a poll (the next one tries again). */
  private readonly actionError = signal<string | null>(null);
  protected readonly loadError = computed(() => {
    if (this.actionError()) return this.actionError();
    if (this.day() && this.data.status() === 'error') return `${describeApiError(this.data.error())} Still trying.`;
    return null;
  });
  protected readonly routes = signal<RoadRouteSummary[]>([]);
  protected readonly isStarting = signal(false);

  protected readonly canEdit = computed(() => this.session.can('service-days.edit'));
  protected readonly result = computed(() => {
    const state = this.resultState();
    return state.status === 'ready' ? state.result : null;
  });

  protected readonly blocks = computed(() => orderBlocks(this.result()?.blocks ?? []));
  protected readonly failing = computed(() => this.blocks().filter((block) => !block.feasible));
  protected readonly series = computed(() => {
    const result = this.result();
    const day = this.day();
    return result && day ? socChartSeries(result, day.reserveSoc) : [];
  });
  protected readonly timeline = computed(() => {
    const day = this.day();
    if (!day) return [];
    return timelineRows(day.blocks, (routeId) => this.routes().find((route) => route.id === routeId), this.result());
  });
  protected readonly worsened = computed(() => worsenedDescents(this.result()?.blocks ?? [], riskRank));
  protected readonly peaks = computed(() =>
    [...(this.result()?.peakChargingPowerW ?? [])]
      .sort((a, b) => b.powerW - a.powerW)
      .map((peak) => ({ ...peak, name: this.chargerName(peak.chargerKey) })),
  );
  protected readonly isRunning = computed(() => {
    const day = this.day();
    return day !== null && isGoing(day);
  });

  constructor() {
    // A day still queued or running is asked for again until it settles.
    reloadWhileGoing(this.data, this.day, isGoing, POLL_INTERVAL_MS);
    void this.routesApi.list().then(
      (routes) => this.routes.set(routes),
      () => undefined, // Only the timeline's route names and estimated arrivals need them.
    );
  }

  protected vehicleSentence(block: ServiceDayResult['blocks'][number]): string {
    return blockVehicleSentence(block, this.day()?.batteryAge ?? 'beginning-of-life', this.units());
  }

  protected chargerName(key: string): string {
    return this.day()?.chargers.find((charger) => charger.key === key)?.name ?? key;
  }

  protected routeName(routeId: string): string {
    return this.routes().find((route) => route.id === routeId)?.name ?? 'Route';
  }

  protected time(timeS: number): string {
    return formatServiceTime(timeS);
  }

  protected temperature(celsius: number): string {
    return formatTemperatureReached(celsius, this.units());
  }

  protected exportUrl(kind: ServiceDayExportKind): string {
    return this.api.exportUrl(this.serviceDayId(), kind);
  }

  protected async run(): Promise<void> {
    const day = this.day();
    if (!day) return;
    this.isStarting.set(true);
    this.actionError.set(null);
    try {
      // Queued now: the polling follows it until it settles.
      this.day.set(await this.api.run(day.id));
    } catch (error: unknown) {
      this.actionError.set(describeApiError(error));
    } finally {
      this.isStarting.set(false);
    }
  }

  /** Deletes the service day after asking (restorable under Recently deleted) and goes back to the list. */
  protected async remove(): Promise<void> {
    const day = this.day();
    if (!day) return;
    const confirmed = await confirmDelete(this.dialog, {
      what: 'service day',
      name: day.name,
      consequence: 'The service day and its results leave the list and the network summary.',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(day.id);
      await this.router.navigate(['/service-days']);
    } catch (error: unknown) {
      this.actionError.set(describeApiError(error));
    }
  }
}
