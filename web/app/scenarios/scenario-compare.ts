import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { ScenarioComparison } from '@shared/domain/scenarios';
import { DistanceChart, type ChartSeries } from '../charts/distance-chart';
import {
  DIRECTION_LABELS as FIGURE_DIRECTIONS,
  RISK_LABELS,
  RISK_ORDER,
  SUMMARY_FIGURES,
  countByRisk,
  describeDescentAdvice,
  differenceTone,
  formatFigure,
  formatFigureDifference,
  formatStretch,
  formatTemperatureReached,
  worstDescent,
} from '@shared/presentation/index';
import { unitLabel, type Quantity } from '../units/unit-format';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { COMPARE_COLORS, brakeTemperatureSeries, elevationSeries, socSeries, speedSeries } from './result-series';
import { DIRECTION_LABELS, describeLoad, describeSeason } from '@shared/presentation/index';
import { loadStateOf, type LoadState } from '../ui/load-state';
import { LoadStatus } from '../ui/load-status';
import { ScenariosApi } from './scenarios-api';

/** The comparison as it loads, or the page asking for two to four scenarios. */
type CompareState = LoadState<ScenarioComparison> | { status: 'choose'; chosen: number };

/** Fewest and most scenarios compared at once. */
const COMPARED = { min: 2, max: 4 } as const;

/** Two to four scenarios side by side: the same charts overlaid and a table of differences. */
@Component({
  selector: 'app-scenario-compare',
  imports: [RouterLink, MatButtonModule, MatIconModule, DistanceChart, UnitSwitch, LoadStatus],
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
  private readonly chosenIds = computed(
    () =>
      (this.ids() ?? '')
        .split(',')
        .map((id) => id.trim())
        .filter(Boolean),
    { equal: (a, b) => a.length === b.length && a.every((id, i) => id === b[i]) },
  );
  /** Loaded when two to four ids are chosen; new ids drop the answer for the old ones. */
  private readonly comparison = resource({
    params: () => {
      const ids = this.chosenIds();
      return ids.length >= COMPARED.min && ids.length <= COMPARED.max ? { ids } : undefined;
    },
    loader: ({ params }) => this.api.compare(params.ids),
  });
  private readonly loaded = loadStateOf(this.comparison);
  protected readonly state = computed<CompareState>(() => {
    const chosen = this.chosenIds().length;
    return chosen < COMPARED.min || chosen > COMPARED.max ? { status: 'choose', chosen } : this.loaded();
  });
  protected readonly hoverX = signal<number | null>(null);

  protected readonly items = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.value.items : [];
  });

  /** The first direction of each result, overlaid (one colour per scenario). */
  protected readonly charts = computed(() => {
    const system = this.units();
    const withResults = this.items()
      .map((item, index) => ({ item, color: COMPARE_COLORS[index % COMPARE_COLORS.length]!, direction: item.result?.directions[0] }))
      .filter((entry) => entry.direction !== undefined);
    const overlay = (make: (entry: (typeof withResults)[number]) => ChartSeries): ChartSeries[] => withResults.map(make);
    return {
      elevation: overlay(({ item, color, direction }) => ({
        ...elevationSeries(direction!.profile, system, item.scenario.name, color),
        fill: false,
        segmentFill: undefined,
      })),
      speed: overlay(({ item, color, direction }) => speedSeries(direction!.profile, system, item.scenario.name, color)),
      soc: overlay(({ item, color, direction }) => socSeries(direction!.profile, system, item.scenario.name, color)),
      brake: overlay(({ item, color, direction }) => brakeTemperatureSeries(direction!.profile, system, item.scenario.name, color)),
    };
  });

  /**
   * The differences table: every figure of the shared catalogue (the names and rounding of the
   * result screen and the PDF), then the descents: the highest risk and the worst descent.
   */
  protected readonly rows = computed(() => {
    const system = this.units();
    const results = this.items().map((item) => item.result);
    const base = results[0]?.summary;
    const figureRows = SUMMARY_FIGURES.map((figure) => ({
      label: figure.label,
      cells: results.map((result, index) => {
        if (!result) return { value: '—', difference: '', tone: 'neutral' };
        const difference = index > 0 && base ? formatFigureDifference(figure, result.summary, base, system) : '';
        const tone = index > 0 && base ? differenceTone(figure, result.summary, base) : 'neutral';
        return { value: formatFigure(figure, result.summary, system), difference, tone };
      }),
    }));
    const riskRow = {
      label: 'Highest descent risk',
      cells: results.map((result) => {
        if (!result) return { value: '—', difference: '', tone: 'neutral' };
        const counts = countByRisk(result.directions);
        const highest = [...RISK_ORDER].reverse().find((risk) => counts[risk] > 0);
        if (!highest) return { value: 'No descent', difference: '', tone: 'neutral' };
        const others = RISK_ORDER.filter((risk) => risk !== 'low' && counts[risk] > 0).map(
          (risk) => `${counts[risk]} ${RISK_LABELS[risk].toLowerCase()}`,
        );
        return { value: RISK_LABELS[highest], difference: others.join(', '), tone: 'neutral', risk: highest };
      }),
    };
    const worstRow = {
      label: 'Worst descent',
      cells: results.map((result) => {
        const worst = result ? worstDescent(result.directions) : null;
        if (!worst) return { value: '—', difference: '', tone: 'neutral' };
        const { descent, direction } = worst;
        return {
          value: `${formatStretch(descent.startM, descent.endM, system)} ${FIGURE_DIRECTIONS[direction].toLowerCase()}`,
          difference: `${formatTemperatureReached(descent.peakBrakeTempC, system)} peak; ${describeDescentAdvice(descent, system).short}`,
          tone: 'neutral',
        };
      }),
    };
    return [...figureRows, riskRow, worstRow];
  });

  protected readonly caution = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.value.caution : '';
  });

  protected unit(quantity: Quantity): string {
    return unitLabel(quantity, this.units());
  }

  protected reload(): void {
    this.comparison.reload();
  }
}
