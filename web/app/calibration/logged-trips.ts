import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, linkedSignal, resource, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import type { LoggedTrip } from '@shared/domain/logged-trips';
import type { RoadRouteSummary } from '@shared/domain/road-routes';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { BRAKE_FIT_PARAMETERS, FIT_PARAMETER_LABELS, type FitParameter } from '@shared/engine/calibration-parameters';
import type { Subscription } from 'rxjs';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { RoadRoutesApi } from '../road-routes/road-routes-api';
import { formatFileSize } from '../terrain/terrain-format';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { VehicleProfilesApi } from '../vehicles/vehicle-profiles-api';
import { signedPercent } from './calibration-format';
import { CalibrationApi, type CalibrationSummary } from './calibration-api';
import { FileDrop } from '../ui/file-drop';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';

type UploadState =
  | { status: 'idle' }
  | { status: 'uploading'; sentBytes: number; totalBytes: number }
  | { status: 'stored'; trip: LoggedTrip }
  | { status: 'error'; message: string };

const DEFAULT_FIT: FitParameter[] = ['rollingResistanceCoefficient', 'dragAreaM2', 'auxPowerW', 'drivetrainEfficiency', 'regenEfficiency'];

/**
 * Measured runs of one vehicle profile: its logged trips, the upload (with progress), the fit
 * of the profile to chosen trips, and the calibrations made so far.
 */
@Component({
  selector: 'app-logged-trips',
  imports: [
    FileDrop,
    LoadStatus,
    DatePipe,
    DecimalPipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    QuantityPipe,
    UnitSwitch,
  ],
  templateUrl: './logged-trips.html',
  styleUrl: './logged-trips.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class LoggedTrips {
  private readonly api = inject(CalibrationApi);
  private readonly profiles = inject(VehicleProfilesApi);
  private readonly routesApi = inject(RoadRoutesApi);
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  /** From `vehicles/:vehicleProfileId/logged-trips`. */
  readonly vehicleProfileId = input.required<string>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly signedPercent = signedPercent;
  protected readonly labels = FIT_PARAMETER_LABELS;
  protected readonly formatFileSize = formatFileSize;
  /** The profile, its trips, calibrations and the routes, asked for by profile id: a new id drops the earlier answer. */
  protected readonly data = resource({
    params: () => ({ id: this.vehicleProfileId() }),
    loader: async ({ params }) => {
      const [profile, trips, calibrations, routes] = await Promise.all([
        this.profiles.get(params.id),
        this.api.trips(params.id),
        this.api.calibrations(params.id),
        this.routesApi.list(),
      ]);
      return { profile, trips, calibrations, routes };
    },
  });
  protected readonly loaded = loadStateOf(this.data);
  protected readonly isLoading = computed(() => this.data.isLoading());
  protected readonly profile = computed<VehicleProfile | null>(() => (this.data.hasValue() ? this.data.value().profile : null));
  /** The loaded trips, then kept in step with uploads and deletions here. */
  protected readonly trips = linkedSignal<LoggedTrip[]>(() => (this.data.hasValue() ? this.data.value().trips : []));
  protected readonly calibrations = computed<CalibrationSummary[]>(() => (this.data.hasValue() ? this.data.value().calibrations : []));
  /** The loaded routes, asked for again after an upload that may have made one from its track. */
  protected readonly routes = linkedSignal<RoadRouteSummary[]>(() => (this.data.hasValue() ? this.data.value().routes : []));
  /** A deletion that failed, in words. */
  protected readonly actionError = signal<string | null>(null);

  protected readonly canWrite = computed(() => this.session.can('calibration.edit'));

  // Upload
  protected readonly file = signal<File | null>(null);
  protected readonly upload = signal<UploadState>({ status: 'idle' });
  protected readonly routeId = new FormControl<string>('', { nonNullable: true });
  protected readonly payloadKg = new FormControl<number | null>(null);
  protected readonly ambientC = new FormControl<number | null>(null);
  protected readonly elevationSource = new FormControl<'auto' | 'route' | 'file'>('auto', { nonNullable: true });
  protected readonly tripName = new FormControl<string>('', { nonNullable: true });
  protected readonly percent = computed(() => {
    const state = this.upload();
    return state.status === 'uploading' && state.totalBytes > 0 ? Math.round((100 * state.sentBytes) / state.totalBytes) : 0;
  });
  private uploading: Subscription | null = null;

  // Fit
  protected readonly selected = signal<ReadonlySet<string>>(new Set());
  protected readonly chosenParameters = signal<ReadonlySet<FitParameter>>(new Set(DEFAULT_FIT));
  protected readonly isFitting = signal(false);
  protected readonly fitError = signal<string | null>(null);
  protected readonly selectedTrips = computed(() => this.trips().filter((trip) => this.selected().has(trip.id)));
  /** Parameters the chosen trips can inform. */
  protected readonly fittable = computed<FitParameter[]>(() => {
    const chosen = this.selectedTrips();
    return [
      ...DEFAULT_FIT,
      ...(chosen.some((trip) => trip.payloadKg === null) ? (['payloadKg'] as const) : []),
      ...(chosen.some((trip) => trip.channels.brakeTemperature) ? BRAKE_FIT_PARAMETERS : []),
    ];
  });

  constructor() {
    inject(DestroyRef).onDestroy(() => this.uploading?.unsubscribe());
  }

  protected isChosen(key: FitParameter): boolean {
    return this.chosenParameters().has(key) && this.fittable().includes(key);
  }

  protected toggleParameter(key: FitParameter, on: boolean): void {
    const next = new Set(this.chosenParameters());
    if (on) next.add(key);
    else next.delete(key);
    this.chosenParameters.set(next);
  }

  protected toggleTrip(trip: LoggedTrip, on: boolean): void {
    const next = new Set(this.selected());
    if (on) next.add(trip.id);
    else next.delete(trip.id);
    this.selected.set(next);
    // Payload and brake parameters join the fit by default when the trips call for them.
    const extra = this.fittable().filter((key) => !DEFAULT_FIT.includes(key));
    if (on && extra.length > 0) this.chosenParameters.set(new Set([...this.chosenParameters(), ...extra]));
  }

  protected chooseFile(event: Event): void {
    const picker = event.target as HTMLInputElement;
    const chosen = picker.files?.[0];
    if (chosen) this.takeFile(chosen);
    picker.value = '';
  }

  protected startUpload(): void {
    const file = this.file();
    if (!file || this.upload().status === 'uploading') return;
    this.upload.set({ status: 'uploading', sentBytes: 0, totalBytes: file.size });
    this.uploading = this.api
      .upload(this.vehicleProfileId(), file, {
        routeId: this.routeId.value || undefined,
        payloadKg: this.payloadKg.value ?? undefined,
        ambientC: this.ambientC.value ?? undefined,
        elevationSource: this.elevationSource.value,
        name: this.tripName.value.trim() || undefined,
      })
      .subscribe({
        next: (progress) => {
          if (progress.kind === 'progress') {
            this.upload.set({ status: 'uploading', sentBytes: progress.sentBytes, totalBytes: progress.totalBytes });
          } else {
            this.upload.set({ status: 'stored', trip: progress.trip });
            this.trips.set([progress.trip, ...this.trips()]);
            this.file.set(null);
            this.tripName.setValue('');
            void this.loadRoutes();
          }
        },
        error: (error: unknown) => this.upload.set({ status: 'error', message: describeApiError(error) }),
      });
  }

  protected cancelUpload(): void {
    this.uploading?.unsubscribe();
    this.upload.set({ status: 'idle' });
  }

  protected async remove(trip: LoggedTrip): Promise<void> {
    if (!window.confirm(`Delete the logged trip “${trip.name}”?`)) return;
    this.actionError.set(null);
    try {
      await this.api.deleteTrip(trip.id);
      this.trips.set(this.trips().filter((candidate) => candidate.id !== trip.id));
      this.toggleTrip(trip, false);
    } catch (error: unknown) {
      this.actionError.set(describeApiError(error));
    }
  }

  protected async fit(): Promise<void> {
    const ids = [...this.selected()];
    const fit = this.fittable().filter((key) => this.chosenParameters().has(key));
    if (ids.length === 0 || fit.length === 0) return;
    this.isFitting.set(true);
    this.fitError.set(null);
    try {
      const calibration = await this.api.requestCalibration(this.vehicleProfileId(), { loggedTripIds: ids, fit });
      await this.router.navigate(['/vehicles', this.vehicleProfileId(), 'calibrations', calibration.id]);
    } catch (error: unknown) {
      this.fitError.set(describeApiError(error));
    } finally {
      this.isFitting.set(false);
    }
  }

  protected routeLabel(trip: LoggedTrip): string {
    const how = trip.routeCreated === 'created' ? 'made from the track' : trip.routeCreated === 'matched' ? 'matched' : 'as given';
    return `${trip.routeName}${trip.routeVersion ? ` v${trip.routeVersion}` : ''} · ${trip.direction === 'reverse' ? 'against its direction' : 'in its direction'} · ${how}`;
  }

  protected channels(trip: LoggedTrip): string {
    const names = [
      trip.channels.batteryPower && 'battery power',
      trip.channels.soc && 'SOC',
      trip.channels.brakeTemperature && 'brake temperature',
      trip.channels.elevation && 'elevation',
      trip.channels.passengers && 'passengers',
    ].filter(Boolean);
    return names.length > 0 ? names.join(', ') : 'speed and position only';
  }

  protected statusTone(status: string): string {
    return status === 'done' ? 'done' : status === 'failed' ? 'failed' : 'pending';
  }

  protected takeFile(file: File): void {
    this.file.set(file);
    if (this.upload().status !== 'uploading') this.upload.set({ status: 'idle' });
  }

  private async loadRoutes(): Promise<void> {
    this.routes.set(await this.routesApi.list());
  }
}
