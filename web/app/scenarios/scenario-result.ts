import { DatePipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, resource, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink } from '@angular/router';
import type { Descent, RiskLevel } from '@shared/domain/analysis';
import type { Scenario } from '@shared/domain/scenarios';
import { DistanceChart, type ChartSeries } from '../charts/distance-chart';
import { describeApiError, apiErrorBody } from '../core/api-error-message';
import { Session } from '../core/session';
import { confirmDelete } from '../ui/confirm-delete-dialog';
import { staleSentence } from '../ui/stale-reasons';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';
import { latestAnswer, reloadWhileGoing, storedResult } from '../ui/polled-resource';
import { AdviceCautions } from '../ui/advice-cautions';
import { DescentSafety } from '../descents/descent-safety';
import { TerrainMap, type MapOverlay, type MapPosition } from '../map/terrain-map';
import { QuantityPipe } from '../units/quantity-pipe';
import { fromDisplay, toDisplay, unitLabel } from '../units/unit-format';
import {
  RISK_ORDER,
  RISK_STYLES,
  SUMMARY_FIGURES,
  formatFigure,
  formatSafeSpeed,
  formatSocLimit,
  formatTemperatureReached,
  needsCaution,
} from '@shared/presentation/index';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import {
  GRADE_LEGEND,
  batterySeries,
  brakeTemperatureSeries,
  elevationSeries,
  forceSeries,
  nearestIndex,
  speedSeries,
} from './result-series';
import { brakeRiskBands } from '../charts/risk-bands';
import { DIRECTION_LABELS, SCENARIO_STATUS_LABELS, describeLoad, describeSeason, riskRank } from '@shared/presentation/index';
import { RiskTag } from '../ui/risk-tag';
import { ScenariosApi, descentCardsUrl, type ResultScreenData, type ResultScreenDirection } from './scenarios-api';

/** How often a queued or running scenario is asked for its status, ms. */
const POLL_INTERVAL_MS = 1_500;

/** One scenario's results: figures, linked charts along the route, the map and the descents. */
/** Pins at the two ends of the direction shown, and their legend. */
const START_COLOUR = '#3f7f4f';
const END_COLOUR = '#1a1c1e';

/** The figures shown as cards, in the catalogue's order; length, ascent and descent sit under them. */
const CARD_FIGURES: readonly string[] = [
  'tractionEnergyWh',
  'regenEnergyWh',
  'frictionBrakeEnergyWh',
  'retarderEnergyWh',
  'auxEnergyWh',
  'batteryNetEnergyWh',
  'kWhPerKm',
  'endSoc',
  'peakBrakeTempC',
];

@Component({
  selector: 'app-scenario-result',
  imports: [
    AdviceCautions,
    RiskTag,
    DescentSafety,
    DatePipe,
    PercentPipe,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    MatMenuModule,
    MatProgressBarModule,
    MatTooltipModule,
    DistanceChart,
    TerrainMap,
    QuantityPipe,
    UnitSwitch,
    LoadStatus,
  ],
  templateUrl: './scenario-result.html',
  styleUrl: './scenario-result.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ScenarioResultScreen {
  private readonly api = inject(ScenariosApi);
  private readonly dialog = inject(MatDialog);
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  /** From `scenarios/:scenarioId`. */
  readonly scenarioId = input.required<string>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly directionLabels = DIRECTION_LABELS;
  protected readonly statusLabels = SCENARIO_STATUS_LABELS;
  protected readonly riskStyles = RISK_STYLES;
  protected readonly riskOrder = RISK_ORDER;
  protected readonly staleSentence = staleSentence;
  protected readonly startColour = START_COLOUR;
  protected readonly endColour = END_COLOUR;
  protected readonly gradeLegend = GRADE_LEGEND;

  /**
   * The scenario, asked for by id: a new id drops the earlier answer, and a queued or running
   * scenario is asked for again (`reload`) until it settles. Expected failures: unknown id (404),
   * server unreachable, an answer that fails the shared schema.
   */
  protected readonly data = resource({
    params: () => ({ scenarioId: this.scenarioId() }),
    loader: ({ params }) => this.api.get(params.scenarioId),
  });
  protected readonly loadState = loadStateOf(this.data);
  /**
   * The last answer for the current id: kept while a poll reloads or fails, replaced by the
   * answer to "Run again", dropped on a new id.
   */
  protected readonly scenario = latestAnswer(this.scenarioId, this.data);
  /** The stored result, asked for again only when the scenario was computed again; null: none stored. */
  private readonly stored = storedResult(this.scenarioId, this.scenario, async (jobId): Promise<ResultScreenData | null> => {
    try {
      return await this.api.result(jobId);
    } catch (error: unknown) {
      // Expected when the result went between the two requests (a run failed and cleared it).
      if (apiErrorBody(error)?.code === 'not_found') return null;
      throw error;
    }
  });
  protected readonly resultData = this.stored.data;
  private readonly shownResult = this.stored.shown;
  protected readonly resultState = this.stored.state;
  protected readonly resultLoadState = this.stored.loadState;
  /** What failed after the page was shown: an action ("Run again", Delete) or a poll (the next one tries again). */
  private readonly actionError = signal<string | null>(null);
  protected readonly loadError = computed(() => {
    if (this.actionError()) return this.actionError();
    if (this.scenario() && this.data.status() === 'error') return `${describeApiError(this.data.error())} Still trying.`;
    if (this.shownResult() && this.resultData.status() === 'error') return describeApiError(this.resultData.error());
    return null;
  });
  protected readonly isStarting = signal(false);
  protected readonly directionIndex = signal(0);
  /** Distance under the pointer on any chart, displayed unit. */
  protected readonly hoverX = signal<number | null>(null);
  protected readonly fitTo = signal<MapPosition[] | null>(null);

  protected readonly canRun = computed(() => this.session.can('scenarios.edit'));

  protected readonly result = computed(() => {
    const state = this.resultState();
    return state.status === 'ready' ? state.result : null;
  });

  protected readonly direction = computed<ResultScreenDirection | null>(() => {
    const result = this.result();
    return result ? (result.directions[this.directionIndex()] ?? result.directions[0] ?? null) : null;
  });

  protected readonly descents = computed(() => this.direction()?.descents ?? []);
  /** Start of the descent whose assessment is open (null: the riskiest of the direction). */
  protected readonly chosenStartM = signal<number | null>(null);
  protected readonly selectedDescent = computed<Descent | null>(() => {
    const descents = this.descents();
    const chosen = descents.find((descent) => descent.startM === this.chosenStartM());
    if (chosen) return chosen;
    return descents.reduce<Descent | null>(
      (worst, descent) => (!worst || riskRank(descent.risk) > riskRank(worst.risk) ? descent : worst),
      null,
    );
  });
  protected readonly selectedIndex = computed(() => {
    const selected = this.selectedDescent();
    return selected ? this.descents().indexOf(selected) : -1;
  });

  protected readonly riskCounts = computed<Record<RiskLevel, number>>(() => {
    const counts: Record<RiskLevel, number> = { low: 0, elevated: 0, high: 0, critical: 0 };
    for (const direction of this.result()?.directions ?? []) for (const descent of direction.descents) counts[descent.risk]++;
    return counts;
  });

  /** Whether any descent is at elevated risk or worse: the caution is then shown at the top. */
  protected readonly hasRiskyDescent = computed(() =>
    (this.result()?.directions ?? []).some((direction) => direction.descents.some((descent) => needsCaution(descent.risk))),
  );

  /** The summary cards: the shared figure catalogue, the same names and values as the PDF report. */
  protected readonly figures = computed(() => {
    const summary = this.result()?.summary;
    if (!summary) return [];
    const system = this.units();
    return SUMMARY_FIGURES.filter((figure) => CARD_FIGURES.includes(figure.key)).map((figure) => ({
      label: figure.label,
      meaning: figure.meaning,
      value: formatFigure(figure, summary, system),
      tone: figure.key === 'regenEnergyWh' ? 'good' : figure.key === 'frictionBrakeEnergyWh' ? 'warn' : null,
    }));
  });

  /** Whether any descent of the direction shown puts energy into a retarder or braking resistor. */
  protected readonly hasRetarder = computed(() => this.descents().some((descent) => descent.retarderEnergyWh > 0.5));

  protected readonly charts = computed(() => {
    const direction = this.direction();
    if (!direction) return null;
    const system = this.units();
    const profile = direction.profile;
    return {
      elevation: [elevationSeries(profile, system)],
      forces: forceSeries(profile, system),
      speed: [speedSeries(profile, system)],
      battery: batterySeries(profile, system),
      brake: [brakeTemperatureSeries(profile, system)] as ChartSeries[],
      bands: brakeRiskBands(direction.descents[0]?.fadeThresholdC, system),
    };
  });

  protected readonly overlays = computed<MapOverlay[]>(() => {
    const direction = this.direction();
    if (!direction) return [];
    const { profile } = direction;
    const positions = profile.lon.map((lon, i) => [lon, profile.lat[i]!] as MapPosition);
    const overlays: MapOverlay[] = [{ kind: 'line', id: 'route', positions, color: '#0b5567', weight: 5 }];
    direction.descents.forEach((descent, index) => {
      const from = nearestIndex(profile.distanceM, descent.startM);
      const to = nearestIndex(profile.distanceM, descent.endM);
      overlays.push({
        kind: 'line',
        id: `descent:${index}`,
        positions: positions.slice(from, to + 1),
        color: RISK_STYLES[descent.risk].accent,
        weight: 8,
        label: `Descent ${index + 1}: ${RISK_STYLES[descent.risk].label} risk`,
      });
    });
    if (positions.length > 0) {
      overlays.push({ kind: 'pin', id: 'start', at: positions[0]!, color: START_COLOUR, label: 'Start' });
      overlays.push({ kind: 'pin', id: 'end', at: positions.at(-1)!, color: END_COLOUR, label: 'End' });
    }
    return overlays;
  });

  protected readonly highlight = computed<MapPosition | null>(() => {
    const x = this.hoverX();
    const profile = this.direction()?.profile;
    if (x === null || !profile) return null;
    const index = nearestIndex(profile.distanceM, fromDisplay('distance', x, this.units()));
    return index < 0 ? null : [profile.lon[index]!, profile.lat[index]!];
  });

  constructor() {
    // A scenario still queued or running is asked for again until it settles.
    reloadWhileGoing(this.data, this.scenario, isRunning, POLL_INTERVAL_MS);
    effect(() => {
      const direction = this.direction();
      if (direction) untracked(() => this.fitTo.set(direction.profile.lon.map((lon, i) => [lon, direction.profile.lat[i]!])));
    });
  }

  protected async runAgain(): Promise<void> {
    const scenario = this.scenario();
    if (!scenario) return;
    this.isStarting.set(true);
    try {
      this.actionError.set(null);
      // Queued now: the polling follows it until it settles.
      this.scenario.set(await this.api.run(scenario.id));
    } catch (error: unknown) {
      this.actionError.set(describeApiError(error));
    } finally {
      this.isStarting.set(false);
    }
  }

  /** Deletes the scenario after asking (restorable under Recently deleted) and goes back to the list. */
  protected async deleteScenario(): Promise<void> {
    const scenario = this.scenario();
    if (!scenario) return;
    const confirmed = await confirmDelete(this.dialog, {
      what: 'scenario',
      name: scenario.name,
      consequence: 'The scenario and its results leave the scenario list, the network summary and network-wide runs.',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(scenario.id);
      await this.router.navigate(['/scenarios']);
    } catch (error: unknown) {
      // Expected: the server refused (the interceptor has shown why) or cannot be reached.
      this.actionError.set(describeApiError(error));
    }
  }

  protected cardsUrl(): string {
    return descentCardsUrl(this.scenarioId());
  }

  protected exportUrl(kind: 'csv' | 'geojson' | 'pdf'): string {
    return this.api.exportUrl(this.scenarioId(), kind);
  }

  protected readonly describeLoad = describeLoad;
  protected readonly describeSeason = describeSeason;

  protected unit(quantity: 'distance' | 'speed' | 'elevation' | 'force' | 'temperature'): string {
    return unitLabel(quantity, this.units());
  }

  /** Rounded down, as every output rounds advice (shared/presentation/safety-rounding). */
  protected speedAdvice(descent: Descent): string {
    if (descent.speedAdvice === 'no-limit-needed') return 'No limit needed';
    if (descent.speedAdvice === 'not-drivable') return 'No advice: not drivable as drawn';
    if (descent.speedAdvice === 'not-holdable' || descent.maxSafeSpeedKph === null) return 'Not holdable on friction brakes';
    return formatSafeSpeed(descent.maxSafeSpeedKph, this.units());
  }

  protected socAdvice(descent: Descent): string {
    if (descent.maxTopSoc !== null) return formatSocLimit(descent.maxTopSoc);
    switch (descent.maxTopSocReason) {
      case 'no-soc-keeps-brakes-cool':
        return 'None low enough';
      case 'no-battery':
      case 'no-regeneration':
        return 'Plays no part';
      case 'not-drivable':
        return 'No advice';
      default:
        return 'Regeneration cannot take it';
    }
  }

  protected peakTemperature(descent: Descent): string {
    return formatTemperatureReached(descent.peakBrakeTempC, this.units());
  }

  protected showDescent(descent: Descent): void {
    this.chosenStartM.set(descent.startM);
    const profile = this.direction()?.profile;
    if (!profile) return;
    const from = nearestIndex(profile.distanceM, descent.startM);
    const to = nearestIndex(profile.distanceM, descent.endM);
    this.fitTo.set(profile.lon.slice(from, to + 1).map((lon, i) => [lon, profile.lat[from + i]!]));
  }

  protected markDescent(descent: Descent | null): void {
    if (!descent) {
      this.hoverX.set(null);
      return;
    }
    this.hoverX.set(toDisplay('distance', descent.startM, this.units()));
  }
}

function isRunning(scenario: Scenario): boolean {
  return scenario.status === 'queued' || scenario.status === 'running';
}
