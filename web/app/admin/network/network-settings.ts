import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSnackBar } from '@angular/material/snack-bar';
import { safetySettingsSchema } from '@shared/domain/analysis';
import { networkSettingsUpdateSchema, type NetworkSettingsView } from '@shared/domain/board-summary';
import { describeApiError } from '../../core/api-error-message';
import { NetworkSettingsApi } from './network-settings-api';
import type { LoadState } from '../../ui/load-state';
import { LoadStatus } from '../../ui/load-status';

const safety = safetySettingsSchema.shape;

/** The allowed range of each safety setting, straight from the shared contract. */
const SAFETY_RANGES = {
  worstCaseAmbientC: rangeOf(safety.worstCaseAmbientC.unwrap()),
  fadeMarginK: rangeOf(safety.fadeMarginK.unwrap()),
  maxRoadGradePercent: rangeOf(safety.maxRoadGradePercent.unwrap()),
  crawlSpeedKph: rangeOf(safety.crawlSpeedKph.unwrap()),
  crawlDistanceM: rangeOf(safety.crawlDistanceM.unwrap()),
};

function rangeOf(schema: { minValue: number | null; maxValue: number | null }): { min: number; max: number } {
  return { min: schema.minValue ?? 0, max: schema.maxValue ?? Number.MAX_SAFE_INTEGER };
}

function rangeControl(range: { min: number; max: number }): FormControl<number | null> {
  return new FormControl<number | null>(null, [Validators.required, Validators.min(range.min), Validators.max(range.max)]);
}

/** The money and emission factors behind the board summary, each with where it comes from. */
@Component({
  selector: 'app-network-settings',
  imports: [LoadStatus, DatePipe, ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <section class="app-page" aria-labelledby="network-title">
      <h1 id="network-title" class="app-page-title">Network settings</h1>
      <p class="app-lead">
        The board summary turns recovered braking energy into money and CO₂ with these two factors. Name the source of each: it is printed
        with the summary. The safety settings below apply to every descent assessment from the next run on.
      </p>
      <app-load-status [state]="loadState()" loadingLabel="Loading network settings" (retry)="load()" />
      @if (view(); as view) {
        @if (view.isPlaceholder) {
          <p class="app-caution" role="note">
            <mat-icon>info</mat-icon>
            <span
              >These are the illustrative values Descentry ships with. Replace them with your network's own tariff and grid factor.</span
            >
          </p>
        } @else if (view.updatedAt) {
          <p class="meta">Last changed by {{ view.updatedByName }} on {{ view.updatedAt | date: 'd MMM y, HH:mm' }}.</p>
        }
        <form [formGroup]="form" (ngSubmit)="save()" class="form" aria-label="Network settings">
          <fieldset>
            <legend>Energy price</legend>
            <div class="row">
              <mat-form-field appearance="outline" subscriptSizing="dynamic">
                <mat-label>Tariff per kWh</mat-label>
                <input
                  matInput
                  type="number"
                  inputmode="decimal"
                  step="0.001"
                  min="0"
                  max="10"
                  formControlName="energyTariffPerKWh"
                  required
                />
                <mat-hint>What one kWh of traction energy costs the network.</mat-hint>
                @if (form.controls.energyTariffPerKWh.invalid) {
                  <mat-error>Between 0 and 10.</mat-error>
                }
              </mat-form-field>
              <mat-form-field appearance="outline" class="currency" subscriptSizing="dynamic">
                <mat-label>Currency</mat-label>
                <input matInput formControlName="currency" maxlength="3" autocomplete="off" required />
                <mat-hint>Three letters, e.g. EUR.</mat-hint>
                @if (form.controls.currency.invalid) {
                  <mat-error>Three letters, e.g. EUR.</mat-error>
                }
              </mat-form-field>
            </div>
            <mat-form-field appearance="outline" class="wide" subscriptSizing="dynamic">
              <mat-label>Source of the tariff</mat-label>
              <textarea matInput formControlName="tariffSource" maxlength="300" rows="2" required></textarea>
              <mat-hint>For example the supply contract or the regulator's published price.</mat-hint>
              @if (form.controls.tariffSource.invalid) {
                <mat-error>Name the source.</mat-error>
              }
            </mat-form-field>
          </fieldset>
          <fieldset>
            <legend>Grid emissions</legend>
            <mat-form-field appearance="outline" subscriptSizing="dynamic">
              <mat-label>Emission factor</mat-label>
              <input
                matInput
                type="number"
                inputmode="decimal"
                step="0.001"
                min="0"
                max="2"
                formControlName="gridEmissionFactorKgPerKWh"
                required
              />
              <span matTextSuffix>kg CO₂ per kWh</span>
              <mat-hint>CO₂ emitted to generate one kWh on your grid.</mat-hint>
              @if (form.controls.gridEmissionFactorKgPerKWh.invalid) {
                <mat-error>Between 0 and 2.</mat-error>
              }
            </mat-form-field>
            <mat-form-field appearance="outline" class="wide" subscriptSizing="dynamic">
              <mat-label>Source of the emission factor</mat-label>
              <textarea matInput formControlName="emissionFactorSource" maxlength="300" rows="2" required></textarea>
              @if (form.controls.emissionFactorSource.invalid) {
                <mat-error>Name the source.</mat-error>
              }
            </mat-form-field>
          </fieldset>
          <fieldset>
            <legend>Safety assessment</legend>
            <p class="note">
              Every descent is also assessed in its worst credible case. These figures are the network's own choice: set them with your
              licensed engineers, within local codes and the vehicle makers' limits.
            </p>
            <div class="row">
              <mat-form-field appearance="outline" subscriptSizing="dynamic">
                <mat-label>Worst-case ambient</mat-label>
                <input
                  matInput
                  type="number"
                  inputmode="decimal"
                  step="1"
                  [min]="ranges.worstCaseAmbientC.min"
                  [max]="ranges.worstCaseAmbientC.max"
                  formControlName="worstCaseAmbientC"
                  required
                />
                <span matTextSuffix>°C</span>
                <mat-hint>The hottest day you plan for.</mat-hint>
                @if (form.controls.worstCaseAmbientC.invalid) {
                  <mat-error>Between {{ ranges.worstCaseAmbientC.min }} and {{ ranges.worstCaseAmbientC.max }} °C.</mat-error>
                }
              </mat-form-field>
              <mat-form-field appearance="outline" subscriptSizing="dynamic">
                <mat-label>Margin below fade</mat-label>
                <input
                  matInput
                  type="number"
                  inputmode="decimal"
                  step="5"
                  [min]="ranges.fadeMarginK.min"
                  [max]="ranges.fadeMarginK.max"
                  formControlName="fadeMarginK"
                  required
                />
                <span matTextSuffix>K</span>
                <mat-hint>Speed and SOC advice keep the brakes this far below their fade temperature.</mat-hint>
                @if (form.controls.fadeMarginK.invalid) {
                  <mat-error>Between {{ ranges.fadeMarginK.min }} and {{ ranges.fadeMarginK.max }} K.</mat-error>
                }
              </mat-form-field>
            </div>
            <div class="row">
              <mat-form-field appearance="outline" subscriptSizing="dynamic">
                <mat-label>Steepest road grade</mat-label>
                <input
                  matInput
                  type="number"
                  inputmode="decimal"
                  step="0.5"
                  [min]="ranges.maxRoadGradePercent.min"
                  [max]="ranges.maxRoadGradePercent.max"
                  formControlName="maxRoadGradePercent"
                  required
                />
                <span matTextSuffix>%</span>
                <mat-hint>A route drawn steeper than this is not drivable as drawn.</mat-hint>
                @if (form.controls.maxRoadGradePercent.invalid) {
                  <mat-error>Between {{ ranges.maxRoadGradePercent.min }} and {{ ranges.maxRoadGradePercent.max }} %.</mat-error>
                }
              </mat-form-field>
              <mat-form-field appearance="outline" subscriptSizing="dynamic">
                <mat-label>Crawl speed</mat-label>
                <input
                  matInput
                  type="number"
                  inputmode="decimal"
                  step="1"
                  [min]="ranges.crawlSpeedKph.min"
                  [max]="ranges.crawlSpeedKph.max"
                  formControlName="crawlSpeedKph"
                  required
                />
                <span matTextSuffix>km/h</span>
                <mat-hint>Slower than this for the crawl distance: not drivable as drawn.</mat-hint>
                @if (form.controls.crawlSpeedKph.invalid) {
                  <mat-error>Between {{ ranges.crawlSpeedKph.min }} and {{ ranges.crawlSpeedKph.max }} km/h.</mat-error>
                }
              </mat-form-field>
              <mat-form-field appearance="outline" subscriptSizing="dynamic">
                <mat-label>Crawl distance</mat-label>
                <input
                  matInput
                  type="number"
                  inputmode="decimal"
                  step="10"
                  [min]="ranges.crawlDistanceM.min"
                  [max]="ranges.crawlDistanceM.max"
                  formControlName="crawlDistanceM"
                  required
                />
                <span matTextSuffix>m</span>
                @if (form.controls.crawlDistanceM.invalid) {
                  <mat-error>Between {{ ranges.crawlDistanceM.min }} and {{ ranges.crawlDistanceM.max }} m.</mat-error>
                }
              </mat-form-field>
            </div>
          </fieldset>
          @if (saveError(); as message) {
            <p class="app-inline-error" role="alert"><mat-icon>error</mat-icon>{{ message }}</p>
          }
          <div class="buttons">
            <button matButton="filled" type="submit" [disabled]="saving()">Save settings</button>
          </div>
        </form>
      }
    </section>
  `,
  styles: `
    .note {
      margin: 0;
      color: var(--mat-sys-on-surface-variant);
    }
    .meta {
      color: var(--mat-sys-on-surface-variant);
    }
    .app-caution {
      margin: 0 0 16px;
    }
    .form {
      max-width: 720px;
      display: grid;
      gap: 16px;
    }
    fieldset {
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-medium);
      padding: 12px 16px 16px;
      margin: 0;
      display: grid;
      gap: 16px;
    }
    legend {
      font: var(--mat-sys-title-medium);
      padding: 0 6px;
    }
    .row {
      display: flex;
      gap: 12px;
      flex-wrap: wrap;
    }
    .row mat-form-field {
      flex: 1 1 200px;
    }
    .currency {
      max-width: 200px;
    }
    .wide {
      width: 100%;
    }
    .buttons {
      display: flex;
      justify-content: flex-end;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class NetworkSettings {
  private readonly api = inject(NetworkSettingsApi);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly loadState = signal<LoadState>({ status: 'loading' });
  protected readonly view = signal<NetworkSettingsView | null>(null);
  protected readonly saving = signal(false);
  protected readonly saveError = signal<string | null>(null);
  protected readonly ranges = SAFETY_RANGES;

  protected readonly form = new FormGroup({
    energyTariffPerKWh: new FormControl<number | null>(null, [Validators.required, Validators.min(0), Validators.max(10)]),
    currency: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.pattern(/^\s*[A-Za-z]{3}\s*$/)] }),
    tariffSource: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.pattern(/\S/)] }),
    gridEmissionFactorKgPerKWh: new FormControl<number | null>(null, [Validators.required, Validators.min(0), Validators.max(2)]),
    emissionFactorSource: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.pattern(/\S/)] }),
    worstCaseAmbientC: rangeControl(SAFETY_RANGES.worstCaseAmbientC),
    fadeMarginK: rangeControl(SAFETY_RANGES.fadeMarginK),
    maxRoadGradePercent: rangeControl(SAFETY_RANGES.maxRoadGradePercent),
    crawlSpeedKph: rangeControl(SAFETY_RANGES.crawlSpeedKph),
    crawlDistanceM: rangeControl(SAFETY_RANGES.crawlDistanceM),
  });

  constructor() {
    void this.load();
  }

  protected async load(): Promise<void> {
    this.loadState.set({ status: 'loading' });
    try {
      this.show(await this.api.get());
      this.loadState.set({ status: 'ready' });
    } catch (error: unknown) {
      // Expected: server unreachable or an answer that fails the shared schema.
      this.loadState.set({ status: 'error', message: describeApiError(error) });
    }
  }

  protected async save(): Promise<void> {
    this.form.markAllAsTouched();
    if (this.form.invalid) return;
    this.saving.set(true);
    this.saveError.set(null);
    try {
      const settings = networkSettingsUpdateSchema.parse(this.form.getRawValue());
      this.show(await this.api.save(settings));
      this.snackBar.open('Network settings saved. The board summary uses them from now on.', 'OK');
    } catch (error: unknown) {
      // Expected: the server refused a value (400) or could not be reached.
      this.saveError.set(describeApiError(error));
    } finally {
      this.saving.set(false);
    }
  }

  private show(view: NetworkSettingsView): void {
    this.view.set(view);
    this.form.setValue({
      energyTariffPerKWh: view.energyTariffPerKWh,
      currency: view.currency,
      tariffSource: view.tariffSource,
      gridEmissionFactorKgPerKWh: view.gridEmissionFactorKgPerKWh,
      emissionFactorSource: view.emissionFactorSource,
      worstCaseAmbientC: view.worstCaseAmbientC,
      fadeMarginK: view.fadeMarginK,
      maxRoadGradePercent: view.maxRoadGradePercent,
      crawlSpeedKph: view.crawlSpeedKph,
      crawlDistanceM: view.crawlDistanceM,
    });
  }
}
