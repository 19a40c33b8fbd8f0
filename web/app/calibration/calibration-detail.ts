import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { Calibration } from '@shared/domain/calibrations';
import { DistanceChart } from '../charts/distance-chart';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { QuantityPipe } from '../units/quantity-pipe';
import { unitLabel } from '../units/unit-format';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';
import { latestAnswer, reloadWhileGoing } from '../ui/polled-resource';
import { VehicleProfilesApi } from '../vehicles/vehicle-profiles-api';
import { CalibrationApi } from './calibration-api';
import { FIT_PARAMETER_LABELS, formatChange, formatParameter, residualSeries, signedPercent } from './calibration-format';

/** How often a queued or running fit is asked for its status, ms. */
export const CALIBRATION_POLL_INTERVAL_MS = 1_500;

/**
 * One fit of a profile to logged trips: its parameters with 95 % intervals, the warnings, the
 * errors before and after, the residuals, and the analyst's accept or reject.
 */
@Component({
  selector: 'app-calibration-detail',
  imports: [
    DatePipe,
    DecimalPipe,
    RouterLink,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    DistanceChart,
    QuantityPipe,
    UnitSwitch,
    LoadStatus,
  ],
  templateUrl: './calibration-detail.html',
  styleUrl: './calibration-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class CalibrationDetail {
  private readonly api = inject(CalibrationApi);
  private readonly profiles = inject(VehicleProfilesApi);
  private readonly session = inject(Session);

  readonly vehicleProfileId = input.required<string>();
  readonly calibrationId = input.required<string>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly signedPercent = signedPercent;
  protected readonly labels = FIT_PARAMETER_LABELS;
  protected readonly formatParameter = formatParameter;
  protected readonly formatChange = formatChange;
  /**
   * The fit, asked for by id: a new id drops the earlier answer, and a queued or running fit is
   * asked for again (`reload`) until it settles. Expected failures: unknown id (404), server
   * unreachable, an answer that fails the shared schema.
   */
  protected readonly data = resource({
    params: () => ({ calibrationId: this.calibrationId() }),
    loader: ({ params }) => this.api.calibration(params.calibrationId),
  });
  protected readonly loadState = loadStateOf(this.data);
  /**
   * The last answer for the current id: kept while a poll reloads or fails (the page stays
   * readable and polling goes on), replaced by the answer to a decision, dropped on a new id.
   */
  protected readonly calibration = latestAnswer(this.calibrationId, this.data);
  /** A poll that failed while the fit is shown (the next poll tries again). */
  protected readonly pollError = computed(() =>
    this.data.status() === 'error' && this.calibration() ? describeApiError(this.data.error()) : null,
  );
  /** The profile, asked for once the fit is known and again when the fit settles (its version may have moved). */
  private readonly profileKey = computed(
    () => {
      const c = this.calibration();
      return c ? { vehicleProfileId: c.vehicleProfileId, settled: !isFitting(c) } : undefined;
    },
    { equal: (a, b) => a?.vehicleProfileId === b?.vehicleProfileId && a?.settled === b?.settled },
  );
  protected readonly profileData = resource({
    params: () => this.profileKey(),
    loader: ({ params }) => this.profiles.get(params.vehicleProfileId),
  });
  protected readonly profileState = loadStateOf(this.profileData);
  protected readonly profile = computed(() => (this.profileData.hasValue() ? this.profileData.value() : null));
  protected readonly decisionError = signal<string | null>(null);
  protected readonly isDeciding = signal(false);

  protected readonly canDecide = computed(() => {
    const c = this.calibration();
    return this.session.can('calibration.edit') && c?.decision === null && c.status !== 'queued' && c.status !== 'running';
  });
  protected readonly isStaleFit = computed(() => {
    const c = this.calibration();
    const p = this.profile();
    return !!c && !!p && c.decision === null && p.version !== c.profileVersion;
  });
  protected readonly parameters = computed(() => {
    const result = this.calibration()?.result;
    return result ? [...result.parameters, ...(result.brake?.parameters ?? [])] : [];
  });
  protected readonly residuals = computed(() => {
    const residuals = this.calibration()?.residuals;
    return residuals ? residualSeries(residuals, this.units()) : [];
  });
  protected readonly powerUnit = computed(() => unitLabel('power', this.units()));

  constructor() {
    // A fit still queued or running is asked for again until it settles.
    reloadWhileGoing(this.data, this.calibration, isFitting, CALIBRATION_POLL_INTERVAL_MS);
  }

  protected async decide(decision: 'accept' | 'reject'): Promise<void> {
    const c = this.calibration();
    const p = this.profile();
    if (!c || !p) return;
    const question =
      decision === 'accept'
        ? `Save the fitted values as version ${p.version + 1} of “${p.name}”? Every scenario using the profile will be re-run.`
        : 'Reject this fit? It stays on record; the profile stays as it is.';
    if (!window.confirm(question)) return;
    this.isDeciding.set(true);
    this.decisionError.set(null);
    try {
      this.calibration.set(await this.api.decide(c.id, decision));
      // An accepted fit saved the profile's next version.
      this.profileData.reload();
    } catch (error: unknown) {
      this.decisionError.set(describeApiError(error));
    } finally {
      this.isDeciding.set(false);
    }
  }

  protected interval(low: number | null, high: number | null, key: Parameters<typeof formatParameter>[0]): string {
    if (low === null || high === null) return 'not determined';
    return `${formatParameter(key, low, this.units())} – ${formatParameter(key, high, this.units())}`;
  }
}

function isFitting(calibration: Calibration): boolean {
  return calibration.status === 'queued' || calibration.status === 'running';
}
