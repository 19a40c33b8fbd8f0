import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  resource,
  signal,
  untracked,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatCheckboxModule } from '@angular/material/checkbox';
import type { RetarderType } from '@shared/domain/analysis';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import type { CapabilityCurvesResponse, LoadCase, VehicleProfile } from '@shared/domain/vehicle-profiles';
import { describeApiError } from '../core/api-error-message';
import { confirmDelete } from '../ui/confirm-delete-dialog';
import { LoadStatus } from '../ui/load-status';
import { LOADED, loadStateOf, type LoadState } from '../ui/load-state';
import { Session } from '../core/session';
import type { UnitSystem } from '../units/unit-format';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { CapabilityChart } from './capability-chart';
import {
  VEHICLE_FIELDS,
  VEHICLE_FIELD_GROUPS,
  copPointsMessage,
  crossFieldMessages,
  defaultCopPoints,
  fieldHint,
  fieldMessage,
  isClimateField,
  toCelsius,
  toShownTemperature,
  type CopPoint,
  fieldUnit,
  profileNumbersBasis,
  switchUnits,
  toVehicleDraft,
  toVehicleFormValue,
  RETARDER_TYPE_LABELS,
  type VehicleField,
  type VehicleFormValue,
  type VehicleNumbersBasis,
} from './vehicle-form-model';
import { VehicleProfilesApi } from './vehicle-profiles-api';

type NumberControls = Record<string, FormControl<number | null>>;
type CopRow = FormGroup<{ ambient: FormControl<number | null>; cop: FormControl<number | null> }>;

/** One vehicle profile: every engine parameter, grouped; analysts edit their own, copy presets. */
@Component({
  selector: 'app-vehicle-profile-editor',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    UnitSwitch,
    CapabilityChart,
    LoadStatus,
  ],
  templateUrl: './vehicle-profile-editor.html',
  styleUrl: './vehicle-profile-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class VehicleProfileEditor {
  private readonly api = inject(VehicleProfilesApi);
  private readonly dialog = inject(MatDialog);
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);

  /** From `vehicles/:vehicleProfileId`; absent on `vehicles/new`. */
  readonly vehicleProfileId = input<string | undefined>();
  /** From `vehicles/new?copyOf=`: the profile a new one starts from. */
  readonly copyOf = input<string | undefined>();

  protected readonly units = inject(UnitPreference).system;
  /** Units the number fields currently hold; follows `units` once their values are converted. */
  protected readonly shownUnits = signal(this.units());
  /** SI values behind the shown numbers, so rounding for display never changes a saved value. */
  private basis: VehicleNumbersBasis | null = null;
  protected readonly groups = VEHICLE_FIELD_GROUPS.map((group) => ({
    group,
    fields: VEHICLE_FIELDS.filter((field) => field.group === group),
  }));
  protected readonly retarderTypes = Object.entries(RETARDER_TYPE_LABELS) as [RetarderType, string][];

  /**
   * The profile shown (`vehicles/:id`) or copied (`vehicles/new?copyOf=`), asked for by id: a new
   * id drops the earlier answer and an answer for an earlier id is never used. The form is filled
   * in the loader, once per answer, so a later reload of something else never overwrites what the
   * person typed. Nothing to load for a blank new profile.
   */
  protected readonly data = resource({
    params: () => {
      const id = this.vehicleProfileId();
      const copyOf = this.copyOf();
      if (id) return { id, copy: false };
      return copyOf ? { id: copyOf, copy: true } : undefined;
    },
    loader: async ({ params, abortSignal }) => {
      const profile = await this.api.get(params.id);
      if (!abortSignal.aborted) {
        if (params.copy) this.fillFrom(profile, `${profile.name} (copy)`);
        else this.fillFrom(profile);
      }
      return profile;
    },
  });
  private readonly dataState = loadStateOf(this.data);
  /** Ready at once for a blank new profile; otherwise the profile's load. */
  protected readonly loadState = computed<LoadState>(() => (this.data.status() === 'idle' ? LOADED : this.dataState()));
  /** The saved profile being edited: the loaded one, then the answer to each save. */
  protected readonly profile = linkedSignal<VehicleProfile | null>(() =>
    this.vehicleProfileId() && this.data.hasValue() ? (this.data.value() ?? null) : null,
  );
  /** The profile a new one was copied from. */
  protected readonly source = computed(() => (!this.vehicleProfileId() && this.data.hasValue() ? (this.data.value() ?? null) : null));
  protected readonly isSaving = signal(false);
  /** Why the last save failed, or that some values need attention. */
  protected readonly error = signal<string | null>(null);
  protected readonly capabilityLoad = signal<LoadCase>('seated');
  /** The capability curves of the saved profile (or the one copied), for the load chosen. */
  protected readonly capabilityData = resource({
    params: () => {
      const id = this.vehicleProfileId() ?? this.copyOf();
      return id ? { id, load: this.capabilityLoad() } : undefined;
    },
    loader: ({ params }) => this.api.capability(params.id, params.load),
  });
  /** The curves drawn: the newest answer, the previous chart while another load case is asked for. */
  protected readonly capability = linkedSignal<CapabilityCurvesResponse | undefined, CapabilityCurvesResponse | null>({
    source: () => (this.capabilityData.hasValue() ? this.capabilityData.value() : undefined),
    computation: (curves, previous) => curves ?? (this.capabilityData.status() === 'error' ? null : (previous?.value ?? null)),
  });
  protected readonly capabilityError = computed(() =>
    this.capabilityData.status() === 'error' ? describeApiError(this.capabilityData.error()) : null,
  );

  protected readonly isNew = computed(() => !this.vehicleProfileId());
  protected readonly canEdit = computed(() => this.session.can('vehicles.edit') && (this.isNew() || this.profile()?.isPreset === false));
  protected readonly isAnalyst = computed(() => this.session.can('vehicles.edit'));

  protected readonly numbers = new FormGroup<NumberControls>(
    Object.fromEntries(
      VEHICLE_FIELDS.map((field) => [
        field.key,
        new FormControl<number | null>(
          null,
          field.optional
            ? [rangeValidator(field, () => this.shownUnits())]
            : [Validators.required, rangeValidator(field, () => this.shownUnits())],
        ),
      ]),
    ),
  );
  protected readonly form = new FormGroup({
    name: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(120)] }),
    description: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
    powerSource: new FormControl<'battery' | 'overhead-line'>('battery', { nonNullable: true }),
    brakeType: new FormControl<'disc' | 'drum'>('disc', { nonNullable: true }),
    retarderType: new FormControl<RetarderType>('none', { nonNullable: true }),
    numbers: this.numbers,
    climateEnabled: new FormControl(false, { nonNullable: true }),
    copPoints: new FormArray<CopRow>([]),
  });
  protected readonly climateGroup = 'Cabin climate (service days)';

  private readonly formValue = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly crossMessages = computed(() => {
    this.formValue();
    return crossFieldMessages(this.form.getRawValue() as VehicleFormValue);
  });
  protected readonly climateEnabled = computed(() => {
    this.formValue();
    return this.form.controls.climateEnabled.value;
  });
  protected readonly copMessage = computed(() => {
    this.formValue();
    return this.climateEnabled() ? copPointsMessage(this.form.controls.copPoints.getRawValue(), this.shownUnits()) : null;
  });

  constructor() {
    effect(() => {
      if (this.canEdit()) this.form.enable({ emitEvent: false });
      else this.form.disable({ emitEvent: false });
      untracked(() => this.applyClimateState());
    });
    // Climate fields count (and can block a save) only while the climate is modelled.
    this.form.controls.climateEnabled.valueChanges.subscribe(() => this.applyClimateState());
    effect(() => {
      const system = this.units();
      untracked(() => this.showNumbersIn(system));
    });
  }

  protected hint(field: VehicleField): string {
    return fieldHint(field, this.shownUnits());
  }

  protected temperatureUnit(): string {
    return this.shownUnits() === 'imperial' ? '°F' : '°C';
  }

  protected addCopPoint(): void {
    this.form.controls.copPoints.push(copRow({ ambient: null, cop: null }));
  }

  protected removeCopPoint(index: number): void {
    this.form.controls.copPoints.removeAt(index);
    this.form.controls.copPoints.markAsDirty();
  }

  /** Fills the rows with the engine's default curve, as a starting point to edit. */
  protected useDefaultCop(): void {
    this.setCopRows(defaultCopPoints(this.shownUnits()));
    this.form.controls.copPoints.markAsDirty();
  }

  protected unit(field: VehicleField): string {
    return fieldUnit(field, this.shownUnits());
  }

  protected control(field: VehicleField): FormControl<number | null> {
    return this.numbers.controls[field.key]!;
  }

  /** The message under a field: its own range first, then rules tying it to another field. */
  protected message(field: VehicleField): string | null {
    this.formValue();
    const control = this.control(field);
    return fieldMessage(field, control.value, this.shownUnits()) ?? this.crossMessages()[field.key] ?? null;
  }

  protected showsError(field: VehicleField): boolean {
    const control = this.control(field);
    return (control.touched || control.dirty) && this.message(field) !== null;
  }

  protected async save(): Promise<void> {
    this.form.markAllAsTouched();
    const cross = crossFieldMessages(this.form.getRawValue() as VehicleFormValue);
    if (this.form.invalid || Object.keys(cross).length > 0 || this.copMessage() !== null) {
      this.error.set('Some values need attention; see the messages under the fields.');
      return;
    }
    this.isSaving.set(true);
    this.error.set(null);
    try {
      const vehicleClass = this.profile()?.vehicleClass ?? this.source()?.vehicleClass ?? 'custom';
      const draft = toVehicleDraft(this.form.getRawValue() as VehicleFormValue, vehicleClass, this.shownUnits(), this.basis);
      const id = this.vehicleProfileId();
      const saved = id ? await this.api.update(id, draft) : await this.api.create(draft);
      this.snackBar.open(`Saved “${saved.name}”.`, 'Dismiss');
      if (!id) await this.router.navigate(['/vehicles', saved.id], { replaceUrl: true });
      else this.show(saved);
    } catch (error: unknown) {
      this.error.set(describeApiError(error));
    } finally {
      this.isSaving.set(false);
    }
  }

  protected async remove(): Promise<void> {
    const profile = this.profile();
    if (!profile) return;
    const confirmed = await confirmDelete(this.dialog, {
      what: 'vehicle profile',
      name: profile.name,
      consequence: 'The profile leaves the vehicle library. Scenarios that use it must be deleted or moved to another profile first.',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(profile.id);
      await this.router.navigate(['/vehicles']);
    } catch (error: unknown) {
      // The interceptor has shown why (e.g. scenarios still use the profile).
      console.warn('Vehicle profile not deleted', error);
    }
  }

  private show(profile: VehicleProfile): void {
    this.profile.set(profile);
    this.fillFrom(profile);
  }

  /** Puts a loaded or saved profile in the form, in the units chosen now (`name` for a copy). */
  private fillFrom(profile: VehicleProfile, name?: string): void {
    this.error.set(null);
    this.shownUnits.set(untracked(this.units));
    this.basis = profileNumbersBasis(profile, this.shownUnits());
    const value = toVehicleFormValue(profile, this.shownUnits());
    this.fill(name === undefined ? value : { ...value, name });
    this.form.markAsPristine();
    this.form.markAsUntouched();
  }

  /** Converts the number fields to `system`, from the SI values behind them (typed values included). */
  private showNumbersIn(system: UnitSystem): void {
    const from = this.shownUnits();
    if (system === from) return;
    this.basis = switchUnits(this.numbers.getRawValue(), from, system, this.basis);
    const rows = this.form.controls.copPoints.getRawValue().map((point) => ({
      ambient: point.ambient === null ? null : toShownTemperature(toCelsius(point.ambient, from), system),
      cop: point.cop,
    }));
    this.shownUnits.set(system);
    this.numbers.setValue(this.basis.shown);
    this.setCopRows(rows);
  }

  /** Puts a form value in place, with as many COP rows as it has. */
  private fill(value: VehicleFormValue): void {
    this.setCopRows(value.copPoints, false);
    this.form.setValue(value);
    this.applyClimateState();
  }

  private setCopRows(points: readonly CopPoint[], emit = true): void {
    const rows = this.form.controls.copPoints;
    rows.clear({ emitEvent: false });
    for (const point of points) rows.push(copRow(point), { emitEvent: false });
    if (emit) rows.updateValueAndValidity();
  }

  private applyClimateState(): void {
    const on = this.canEdit() && this.form.controls.climateEnabled.value;
    for (const field of VEHICLE_FIELDS.filter(isClimateField)) {
      const control = this.control(field);
      if (on && control.disabled) control.enable({ emitEvent: false });
      else if (!on && control.enabled) control.disable({ emitEvent: false });
    }
    if (on) this.form.controls.copPoints.enable({ emitEvent: false });
    else this.form.controls.copPoints.disable({ emitEvent: false });
  }
}

function rangeValidator(field: VehicleField, system: () => UnitSystem) {
  return (control: { value: number | null }) => (fieldMessage(field, control.value, system()) ? { range: true } : null);
}

function copRow(point: CopPoint): CopRow {
  return new FormGroup({ ambient: new FormControl<number | null>(point.ambient), cop: new FormControl<number | null>(point.cop) });
}
