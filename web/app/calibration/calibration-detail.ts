import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { Calibration } from '@shared/domain/calibrations';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { DistanceChart } from '../charts/distance-chart';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { QuantityPipe } from '../units/quantity-pipe';
import { unitLabel } from '../units/unit-format';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { VehicleProfilesApi } from '../vehicles/vehicle-profiles-api';
import { CalibrationApi } from './calibration-api';
import { FIT_PARAMETER_LABELS, formatChange, formatParameter, residualSeries, signedPercent } from './calibration-format';

/** How often a queued or running fit is asked for its status, ms. */
const POLL_INTERVAL_MS = 1_500;

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
  protected readonly calibration = signal<Calibration | null>(null);
  protected readonly profile = signal<VehicleProfile | null>(null);
  protected readonly error = signal<string | null>(null);
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
    let timer: ReturnType<typeof setTimeout> | undefined;
    inject(DestroyRef).onDestroy(() => clearTimeout(timer));
    effect(() => {
      const id = this.calibrationId();
      untracked(() => {
        clearTimeout(timer);
        const poll = async () => {
          await this.load(id);
          const status = this.calibration()?.status;
          if (status === 'queued' || status === 'running') timer = setTimeout(() => void poll(), POLL_INTERVAL_MS);
        };
        void poll();
      });
    });
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
      this.profile.set(await this.profiles.get(c.vehicleProfileId));
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

  private async load(id: string): Promise<void> {
    try {
      const calibration = await this.api.calibration(id);
      this.calibration.set(calibration);
      if (!this.profile() || calibration.status === 'done') this.profile.set(await this.profiles.get(calibration.vehicleProfileId));
      this.error.set(null);
    } catch (error: unknown) {
      this.error.set(describeApiError(error));
    }
  }
}
