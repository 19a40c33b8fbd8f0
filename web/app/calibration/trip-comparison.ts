import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { LoggedTrip, ReplayComparison } from '@shared/domain/logged-trips';
import { DistanceChart } from '../charts/distance-chart';
import { TerrainMap, type MapOverlay, type MapPosition } from '../map/terrain-map';
import { nearestIndex } from '../scenarios/result-series';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';
import { QuantityPipe } from '../units/quantity-pipe';
import { unitLabel } from '../units/unit-format';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { CalibrationApi } from './calibration-api';
import { comparisonCharts, comparisonX, type ComparisonAxis, signedPercent } from './calibration-format';

/**
 * One logged trip against the model: the engine replays it on its measured speed, and the
 * measured and modelled battery power, energy, SOC and brake temperature are drawn over each
 * other along distance or time, linked to the map, with the errors.
 */
@Component({
  selector: 'app-trip-comparison',
  imports: [
    DatePipe,
    DecimalPipe,
    RouterLink,
    MatButtonToggleModule,
    MatIconModule,
    DistanceChart,
    LoadStatus,
    TerrainMap,
    QuantityPipe,
    UnitSwitch,
  ],
  templateUrl: './trip-comparison.html',
  styleUrl: './trip-comparison.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class TripComparison {
  private readonly api = inject(CalibrationApi);

  readonly vehicleProfileId = input.required<string>();
  readonly loggedTripId = input.required<string>();
  /** `?calibrationId=`: compare with that fit's parameters instead of the current profile. */
  readonly calibrationId = input<string | undefined>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly signedPercent = signedPercent;
  /** The trip and its replay, asked for by trip and calibration: a change drops the earlier answer. */
  protected readonly data = resource({
    params: () => ({ id: this.loggedTripId(), calibrationId: this.calibrationId() }),
    loader: async ({ params }): Promise<{ trip: LoggedTrip; comparison: ReplayComparison }> => {
      const [trip, comparison] = await Promise.all([this.api.trip(params.id), this.api.comparison(params.id, params.calibrationId)]);
      return { trip, comparison };
    },
  });
  protected readonly loaded = loadStateOf(this.data);
  protected readonly trip = computed<LoggedTrip | null>(() => (this.data.hasValue() ? this.data.value().trip : null));
  protected readonly comparison = computed<ReplayComparison | null>(() => (this.data.hasValue() ? this.data.value().comparison : null));
  protected readonly axis = signal<ComparisonAxis>('distance');
  /** x under the pointer on any chart, in the axis' unit. */
  protected readonly hoverX = signal<number | null>(null);
  protected readonly fitTo = computed<MapPosition[] | null>(() => {
    const s = this.comparison()?.series;
    return s ? s.lon.map((lon, i) => [lon, s.lat[i]!] as MapPosition) : null;
  });

  protected readonly xLabel = computed(() => (this.axis() === 'distance' ? unitLabel('distance', this.units()) : 'minutes'));
  protected readonly charts = computed(() => {
    const comparison = this.comparison();
    return comparison ? comparisonCharts(comparison, this.axis(), this.units()) : null;
  });
  protected readonly overlays = computed<MapOverlay[]>(() => {
    const s = this.comparison()?.series;
    if (!s) return [];
    const positions = s.lon.map((lon, i) => [lon, s.lat[i]!] as MapPosition);
    return [
      { kind: 'line', id: 'trip', positions, color: '#0b5567', weight: 5, label: 'Replay line of the trip' },
      { kind: 'pin', id: 'start', at: positions[0]!, color: '#3f7f4f', label: 'Start' },
      { kind: 'pin', id: 'end', at: positions.at(-1)!, color: '#1a1c1e', label: 'End' },
    ];
  });
  protected readonly highlight = computed<MapPosition | null>(() => {
    const comparison = this.comparison();
    const x = this.hoverX();
    if (!comparison || x === null) return null;
    const xs = comparisonX(comparison, this.axis(), this.units());
    const index = nearestIndex(xs, x);
    return index < 0 ? null : [comparison.series.lon[index]!, comparison.series.lat[index]!];
  });

  protected unit(quantity: 'power' | 'energy' | 'temperature' | 'speed'): string {
    return unitLabel(quantity, this.units());
  }
}
