import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { Summary } from '@shared/domain/analysis';
import type { ScenarioComparison } from '@shared/domain/scenarios';
import { DistanceChart, type ChartSeries } from '../charts/distance-chart';
import { describeApiError } from '../core/api-error-message';
import { formatQuantity, unitLabel, type Quantity } from '../units/unit-format';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { COMPARE_COLORS, brakeTemperatureSeries, elevationSeries, socSeries, speedSeries } from './result-series';
import { DIRECTION_LABELS, describeLoad, describeSeason } from './scenario-labels';
import { ScenariosApi } from './scenarios-api';

/** A row of the differences table: one figure of the whole-scenario summary. */
interface SummaryRow {
  label: string;
  quantity: Quantity;
  value: (summary: Summary) => number;
}

const SUMMARY_ROWS: readonly SummaryRow[] = [
  { label: 'Length', quantity: 'distance', value: (s) => s.lengthM },
  { label: 'Energy drawn', quantity: 'energy', value: (s) => s.batteryNetEnergyWh + s.regenEnergyWh },
  { label: 'Regenerated', quantity: 'energy', value: (s) => s.regenEnergyWh },
  { label: 'Into friction brakes', quantity: 'energy', value: (s) => s.frictionBrakeEnergyWh },
  { label: 'Auxiliary', quantity: 'energy', value: (s) => s.auxEnergyWh },
  { label: 'Net from battery', quantity: 'energy', value: (s) => s.batteryNetEnergyWh },
  { label: 'Per distance', quantity: 'energyPerDistance', value: (s) => s.kWhPerKm },
  { label: 'End SOC', quantity: 'soc', value: (s) => s.endSoc },
  { label: 'Peak brake temperature', quantity: 'temperature', value: (s) => s.peakBrakeTempC },
];

type LoadState =
  | { status: 'loading' }
  | { status: 'choose'; chosen: number }
  | { status: 'ready'; comparison: ScenarioComparison }
  | { status: 'error'; message: string };

/** Two to four scenarios side by side: the same charts overlaid and a table of differences. */
@Component({
  selector: 'app-scenario-compare',
  imports: [RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, DistanceChart, UnitSwitch],
  templateUrl: './scenario-compare.html',
  styleUrl: './scenario-compare.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ScenarioCompare {
  private readonly api = inject(ScenariosApi);

  /** Comma-separated scenario ids, from `?ids=` (undefined when the address has none). */
  readonly ids = input<string | undefined>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly colors = COMPARE_COLORS;
  protected readonly directionLabels = DIRECTION_LABELS;
  protected readonly describeLoad = describeLoad;
  protected readonly describeSeason = describeSeason;
  protected readonly state = signal<LoadState>({ status: 'loading' });
  protected readonly hoverX = signal<number | null>(null);

  protected readonly items = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.comparison.items : [];
  });

  /** The first direction of each result, overlaid (one colour per scenario). */
  protected readonly charts = computed(() => {
    const system = this.units();
    const withResults = this.items()
      .map((item, index) => ({ item, color: COMPARE_COLORS[index % COMPARE_COLORS.length]!, direction: item.result?.directions[0] }))
      .filter((entry) => entry.direction !== undefined);
    const overlay = (make: (entry: (typeof withResults)[number]) => ChartSeries): ChartSeries[] => withResults.map(make);
    return {
      elevation: overlay(({ item, color, direction }) => ({ ...elevationSeries(direction!.profile, system, item.scenario.name, color), fill: false, segmentFill: undefined })),
      speed: overlay(({ item, color, direction }) => speedSeries(direction!.profile, system, item.scenario.name, color)),
      soc: overlay(({ item, color, direction }) => socSeries(direction!.profile, system, item.scenario.name, color)),
      brake: overlay(({ item, color, direction }) => brakeTemperatureSeries(direction!.profile, system, item.scenario.name, color)),
    };
  });

  protected readonly rows = computed(() => {
    const system = this.units();
    const summaries = this.items().map((item) => item.result?.summary ?? null);
    const base = summaries[0];
    return SUMMARY_ROWS.map((row) => ({
      label: row.label,
      cells: summaries.map((summary, index) => {
        if (!summary) return { value: '—', difference: '' };
        const value = row.value(summary);
        const difference = index > 0 && base ? this.difference(row.quantity, value - row.value(base)) : '';
        return { value: formatQuantity(row.quantity, value, system), difference };
      }),
    }));
  });

  protected readonly caution = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.comparison.caution : '';
  });

  constructor() {
    effect(() => {
      const ids = (this.ids() ?? '')
        .split(',')
        .map((id) => id.trim())
        .filter(Boolean);
      untracked(() => void this.load(ids));
    });
  }

  protected unit(quantity: Quantity): string {
    return unitLabel(quantity, this.units());
  }

  /** "+1.2 kWh", "−3 °C": the change from the first scenario (temperatures as differences, no offset). */
  private difference(quantity: Quantity, deltaSi: number): string {
    if (Math.abs(deltaSi) < 1e-9) return '±0';
    const text =
      quantity === 'temperature'
        ? `${Math.round(this.units() === 'metric' ? deltaSi : (deltaSi * 9) / 5)} ${unitLabel('temperature', this.units())}`
        : formatQuantity(quantity, Math.abs(deltaSi), this.units());
    const magnitude = text.replace(/^−/, '');
    return quantity === 'temperature' ? (deltaSi > 0 ? `+${magnitude}` : `−${magnitude.replace(/^-/, '')}`) : `${deltaSi > 0 ? '+' : '−'}${magnitude}`;
  }

  private async load(ids: string[]): Promise<void> {
    if (ids.length < 2 || ids.length > 4) {
      this.state.set({ status: 'choose', chosen: ids.length });
      return;
    }
    this.state.set({ status: 'loading' });
    try {
      this.state.set({ status: 'ready', comparison: await this.api.compare(ids) });
    } catch (error: unknown) {
      this.state.set({ status: 'error', message: describeApiError(error) });
    }
  }
}
