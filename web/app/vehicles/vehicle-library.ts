import { ChangeDetectionStrategy, Component, computed, inject, resource } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { Session } from '../core/session';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { loadStateOf } from '../ui/load-state';
import { LoadStatus } from '../ui/load-status';
import { VehicleProfilesApi } from './vehicle-profiles-api';

/** The vehicle classes (read-only, copy to edit) and the authority's own profiles, as cards. */
@Component({
  selector: 'app-vehicle-library',
  imports: [RouterLink, MatCardModule, MatButtonModule, MatIconModule, QuantityPipe, LoadStatus],
  template: `
    <div class="app-page">
      <h1 class="app-page-title">Vehicle profiles</h1>
      <p class="app-lead">
        Every engine parameter of the vehicles scenarios run with. The vehicle classes are typical figures to start from;
        @if (isAnalyst()) {
          copy one to tune it to your fleet.
        } @else {
          analysts tune copies of them to the fleet.
        }
      </p>
      <app-load-status [state]="state()" loadingLabel="Loading vehicle profiles" (retry)="reload()" />
      @for (section of sections(); track section.title) {
        <section [attr.aria-labelledby]="section.id">
          <h2 [id]="section.id">{{ section.title }}</h2>
          @if (section.profiles.length === 0) {
            <p class="hint">
              None yet.
              @if (isAnalyst()) {
                Copy a vehicle class to make the first one.
              }
            </p>
          }
          <div class="cards">
            @for (profile of section.profiles; track profile.id) {
              <mat-card appearance="outlined" class="profile-card" [attr.data-testid]="'vehicle-' + profile.name">
                <mat-card-header>
                  <mat-icon mat-card-avatar class="avatar">{{
                    profile.vehicle.powerSource === 'overhead-line' ? 'cable' : 'battery_charging_full'
                  }}</mat-icon>
                  <mat-card-title>{{ profile.name }}</mat-card-title>
                  <mat-card-subtitle>{{ profile.isPreset ? 'Vehicle class · read-only' : 'Authority profile' }}</mat-card-subtitle>
                </mat-card-header>
                <mat-card-content>
                  <dl>
                    <dt>Curb mass</dt>
                    <dd>{{ profile.vehicle.curbMassKg | quantity: 'mass' : units() }}</dd>
                    <dt>Traction / regen</dt>
                    <dd>
                      {{ profile.vehicle.tractionPowerW | quantity: 'power' : units() }} /
                      {{ profile.vehicle.regenPowerW | quantity: 'power' : units() }}
                    </dd>
                    @if (profile.vehicle.batteryCapacityWh > 0) {
                      <dt>Battery</dt>
                      <dd>{{ profile.vehicle.batteryCapacityWh | quantity: 'energy' : units() }}</dd>
                    } @else {
                      <dt>Power</dt>
                      <dd>
                        {{ profile.vehicle.powerSource === 'overhead-line' ? 'Overhead line, no traction battery' : 'No traction battery' }}
                      </dd>
                    }
                    <dt>Retarder</dt>
                    <dd>{{ profile.vehicle.retarderPowerW ? (profile.vehicle.retarderPowerW | quantity: 'power' : units()) : 'none' }}</dd>
                  </dl>
                </mat-card-content>
                <mat-card-actions>
                  <a matButton [routerLink]="['/vehicles', profile.id]">{{
                    isAnalyst() && !profile.isPreset ? 'Open and edit' : 'Open'
                  }}</a>
                  @if (isAnalyst()) {
                    <a matButton [routerLink]="['/vehicles/new']" [queryParams]="{ copyOf: profile.id }"
                      ><mat-icon>content_copy</mat-icon> Copy to edit</a
                    >
                  }
                </mat-card-actions>
              </mat-card>
            }
          </div>
        </section>
      }
    </div>
  `,
  styles: `
    h2 {
      font: var(--mat-sys-title-large);
      margin: 24px 0 12px;
    }
    .hint {
      color: var(--mat-sys-on-surface-variant);
    }
    .cards {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(min(280px, 100%), 1fr));
      gap: 16px;
    }
    .avatar {
      display: grid;
      place-items: center;
      background: var(--mat-sys-primary-container);
      color: var(--mat-sys-on-primary-container);
      border-radius: 50%;
    }
    dl {
      display: grid;
      grid-template-columns: auto 1fr;
      gap: 4px 12px;
      margin: 8px 0 0;
      font: var(--mat-sys-body-medium);
    }
    dt {
      color: var(--mat-sys-on-surface-variant);
    }
    dd {
      margin: 0;
      text-align: right;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class VehicleLibrary {
  private readonly api = inject(VehicleProfilesApi);
  private readonly session = inject(Session);

  protected readonly units = inject(UnitPreference).system;
  protected readonly isAnalyst = computed(() => this.session.can('vehicles.edit'));
  private readonly list = resource({ loader: () => this.api.list() });
  protected readonly profiles = computed<VehicleProfile[]>(() => this.list.value() ?? []);
  protected readonly state = loadStateOf(this.list);
  protected readonly sections = computed(() => [
    { id: 'own-profiles', title: "The authority's profiles", profiles: this.profiles().filter((profile) => !profile.isPreset) },
    { id: 'vehicle-classes', title: 'Vehicle classes', profiles: this.profiles().filter((profile) => profile.isPreset) },
  ]);

  protected reload(): void {
    this.list.reload();
  }
}
