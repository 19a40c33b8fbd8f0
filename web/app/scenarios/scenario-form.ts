import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { Router, RouterLink } from '@angular/router';
import type { RoadRouteSummary } from '@shared/domain/road-routes';
import { DIRECTIONS, type Direction } from '@shared/domain/scenarios';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { describeApiError } from '../core/api-error-message';
import { RoadRoutesApi, type RouteVersionInfo } from '../road-routes/road-routes-api';
import { SOC_PERCENT_RANGE, speedLimitRange } from '@shared/presentation/index';
import { unitLabel } from '../units/unit-format';
import { speedLimitValidator } from '../units/speed-limit-validator';
import { UnitPreference } from '../units/unit-preference';
import { VehicleProfilesApi } from '../vehicles/vehicle-profiles-api';
import {
  DEFAULT_SCENARIO_FORM,
  toFormValue,
  toScenarioDraft,
  type LoadChoice,
  type ScenarioFormValue,
  type SeasonChoice,
} from './scenario-form-model';
import { DIRECTION_LABELS, LOAD_LABELS, SEASON_LABELS } from '@shared/presentation/index';
import { ScenariosApi } from './scenarios-api';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';

/** Planners and analysts set up a scenario: route, direction, vehicle, load, season, SOC, options. */
@Component({
  selector: 'app-scenario-form',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatExpansionModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    LoadStatus,
    MatSelectModule,
    MatSlideToggleModule,
  ],
  templateUrl: './scenario-form.html',
  styleUrl: './scenario-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ScenarioForm {
  private readonly scenariosApi = inject(ScenariosApi);
  private readonly routesApi = inject(RoadRoutesApi);
  private readonly vehiclesApi = inject(VehicleProfilesApi);
  private readonly router = inject(Router);

  /** From `scenarios/:scenarioId/edit`; absent on `scenarios/new`. */
  readonly scenarioId = input<string | undefined>();
  /** Pre-selected route (`?routeId=`), e.g. from a route's page. */
  readonly routeId = input<string | undefined>();

  protected readonly units = inject(UnitPreference).system;
  /** The contract's speed-limit range in the displayed unit, for the speed cap and its message. */
  protected readonly speedRange = computed(() => speedLimitRange(this.units()));
  protected readonly socRange = SOC_PERCENT_RANGE;
  protected readonly directions = DIRECTIONS;
  protected readonly directionLabels = DIRECTION_LABELS;
  protected readonly loadChoices: readonly { value: LoadChoice; label: string }[] = [
    { value: 'empty', label: LOAD_LABELS.empty },
    { value: 'seated', label: LOAD_LABELS.seated },
    { value: 'full-standing', label: LOAD_LABELS['full-standing'] },
    { value: 'passengers', label: 'Passenger count' },
  ];
  protected readonly seasonChoices: readonly { value: SeasonChoice; label: string }[] = [
    { value: 'winter', label: SEASON_LABELS.winter },
    { value: 'mild', label: SEASON_LABELS.mild },
    { value: 'summer', label: SEASON_LABELS.summer },
    { value: 'custom', label: 'Custom' },
  ];

  /**
   * The routes and vehicles to choose from, asked for by scenario id; once they are here the form
   * is filled with the scenario (editing) or the pre-selected route and first vehicle (new).
   */
  protected readonly choices = resource({
    params: () => ({ scenarioId: this.scenarioId() }),
    loader: async ({ params, abortSignal }): Promise<{ routes: RoadRouteSummary[]; vehicles: VehicleProfile[] }> => {
      const [routes, vehicles] = await Promise.all([this.routesApi.list(), this.vehiclesApi.list()]);
      const scenario = params.scenarioId ? await this.scenariosApi.get(params.scenarioId) : null;
      // A newer request fills the form instead.
      if (abortSignal.aborted) return { routes, vehicles };
      if (scenario) {
        this.form.setValue(toFormValue(scenario, this.units()));
      } else {
        const routeId = this.routeId() ?? (routes.length === 1 ? routes[0]!.id : '');
        this.form.patchValue({ routeId, vehicleProfileId: vehicles[0]?.id ?? '' });
      }
      return { routes, vehicles };
    },
  });
  protected readonly loaded = loadStateOf(this.choices);
  protected readonly routes = computed<RoadRouteSummary[]>(() => (this.choices.hasValue() ? this.choices.value().routes : []));
  protected readonly vehicles = computed<VehicleProfile[]>(() => (this.choices.hasValue() ? this.choices.value().vehicles : []));
  protected readonly isSaving = signal(false);
  protected readonly error = signal<string | null>(null);

  protected readonly form = new FormGroup({
    name: new FormControl(DEFAULT_SCENARIO_FORM.name, { nonNullable: true, validators: [Validators.required, Validators.maxLength(160)] }),
    routeId: new FormControl(DEFAULT_SCENARIO_FORM.routeId, { nonNullable: true, validators: [Validators.required] }),
    routeVersion: new FormControl<number | null>(DEFAULT_SCENARIO_FORM.routeVersion),
    direction: new FormControl<Direction>(DEFAULT_SCENARIO_FORM.direction, { nonNullable: true }),
    vehicleProfileId: new FormControl(DEFAULT_SCENARIO_FORM.vehicleProfileId, { nonNullable: true, validators: [Validators.required] }),
    load: new FormControl<LoadChoice>(DEFAULT_SCENARIO_FORM.load, { nonNullable: true }),
    passengers: new FormControl(DEFAULT_SCENARIO_FORM.passengers, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(0), Validators.max(400)],
    }),
    season: new FormControl<SeasonChoice>(DEFAULT_SCENARIO_FORM.season, { nonNullable: true }),
    customAmbient: new FormControl(DEFAULT_SCENARIO_FORM.customAmbient, { nonNullable: true, validators: [Validators.required] }),
    customAuxKw: new FormControl(DEFAULT_SCENARIO_FORM.customAuxKw, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(0), Validators.max(500)],
    }),
    startSocPercent: new FormControl(DEFAULT_SCENARIO_FORM.startSocPercent, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(SOC_PERCENT_RANGE.min), Validators.max(SOC_PERCENT_RANGE.max)],
    }),
    spacingM: new FormControl(DEFAULT_SCENARIO_FORM.spacingM, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(1), Validators.max(200)],
    }),
    smoothingWindowM: new FormControl(DEFAULT_SCENARIO_FORM.smoothingWindowM, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(0), Validators.max(5000)],
    }),
    descentSpeedCap: new FormControl<number | null>(DEFAULT_SCENARIO_FORM.descentSpeedCap, {
      validators: [speedLimitValidator(() => this.units())],
    }),
    useStops: new FormControl(DEFAULT_SCENARIO_FORM.useStops, { nonNullable: true }),
    inService: new FormControl(DEFAULT_SCENARIO_FORM.inService, { nonNullable: true }),
  });

  protected readonly load = toSignal(this.form.controls.load.valueChanges, { initialValue: this.form.controls.load.value });
  protected readonly season = toSignal(this.form.controls.season.valueChanges, { initialValue: this.form.controls.season.value });
  private readonly selectedRouteId = toSignal(this.form.controls.routeId.valueChanges, { initialValue: '' });
  /** The chosen route's versions, asked for by route id: choosing another route drops the earlier list. */
  private readonly routeVersions = resource({
    params: () => {
      const routeId = this.selectedRouteId();
      return routeId ? { routeId } : undefined;
    },
    loader: ({ params }) => this.routesApi.versions(params.routeId),
  });
  // While the list is missing or failed, "latest version" is still offered.
  protected readonly versions = computed<RouteVersionInfo[]>(() => (this.routeVersions.hasValue() ? this.routeVersions.value() : []));
  protected readonly presets = computed(() => this.vehicles().filter((profile) => profile.isPreset));
  protected readonly ownProfiles = computed(() => this.vehicles().filter((profile) => !profile.isPreset));

  protected unit(quantity: 'speed' | 'temperature'): string {
    return unitLabel(quantity, this.units());
  }

  protected async save(runAfterSaving: boolean): Promise<void> {
    this.form.markAllAsTouched();
    if (this.form.invalid) {
      this.error.set('Check the highlighted fields.');
      return;
    }
    this.isSaving.set(true);
    this.error.set(null);
    try {
      const draft = toScenarioDraft(this.form.getRawValue() as ScenarioFormValue, this.units());
      const id = this.scenarioId();
      const scenario = id ? await this.scenariosApi.update(id, draft) : await this.scenariosApi.create(draft);
      if (runAfterSaving) await this.scenariosApi.run(scenario.id);
      await this.router.navigate(['/scenarios', scenario.id]);
    } catch (error: unknown) {
      this.error.set(describeApiError(error));
    } finally {
      this.isSaving.set(false);
    }
  }
}
