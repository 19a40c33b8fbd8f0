import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, resource } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { RiskLevel } from '@shared/domain/analysis';
import type { BoardSummary } from '@shared/domain/board-summary';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';
import { RiskChip } from '../ui/risk-chip';
import { RISK_STYLES } from '@shared/presentation/index';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { BoardAnnualBasis } from './board-annual-basis';
import { BOARD_SUMMARY_PDF_URL, BoardApi } from './board-api';
import { formatBoardCo2, formatBoardEnergy, formatBoardMoney, formatBoardNumber, formatTariff } from './board-format';
import { RouteEnergyChart } from './route-energy-chart';
import { DIRECTION_LABELS, boardFigures, boardSafetyCounts, boardYear, boardYearSource, formatStretch } from '@shared/presentation/index';

/** Open safety items, worst first. */
const OPEN_ITEM_LEVELS: readonly Exclude<RiskLevel, 'low'>[] = ['critical', 'high', 'elevated'];

/** The board's one page about the whole network; printable on A4 and downloadable as PDF. */
@Component({
  selector: 'app-board-summary',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, LoadStatus, RiskChip, RouteEnergyChart, QuantityPipe, BoardAnnualBasis],
  templateUrl: './board-summary.html',
  styleUrl: './board-summary.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class BoardSummaryPage {
  private readonly boardApi = inject(BoardApi);

  protected readonly units = inject(UnitPreference).system;
  protected readonly pdfUrl = BOARD_SUMMARY_PDF_URL;
  protected readonly openLevels = OPEN_ITEM_LEVELS;
  protected readonly riskStyles = RISK_STYLES;
  protected readonly directionLabels = DIRECTION_LABELS;
  /** The summary, with its annual section; expected failures: server unreachable or an answer that fails the shared schema. */
  private readonly summaryLoad = resource({ loader: (): Promise<BoardSummary> => this.boardApi.summary() });
  protected readonly state = loadStateOf(this.summaryLoad);

  protected readonly generatedAt = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.value.generatedAt : null;
  });
  protected readonly figures = computed(() => {
    const state = this.state();
    if (state.status !== 'ready') return null;
    const { totals, settings, openSafetyItems } = state.value;
    return {
      recovered: formatBoardEnergy(totals.annualRegenKWh),
      value: formatBoardMoney(totals.regenValue, settings.currency),
      co2: formatBoardCo2(totals.co2AvoidedKg),
      friction: formatBoardEnergy(totals.annualFrictionBrakeKWh),
      net: formatBoardEnergy(totals.annualNetKWh),
      distance: formatBoardNumber(totals.annualKm),
      tariff: formatTariff(settings.energyTariffPerKWh, settings.currency),
      emissionFactor: `${settings.gridEmissionFactorKgPerKWh.toLocaleString('en-GB', { maximumFractionDigits: 4 })} kg CO₂ per kWh`,
      openTotal: openSafetyItems.elevated + openSafetyItems.high + openSafetyItems.critical,
      acceptedTotal: boardSafetyCounts(state.value).accepted,
      acceptedText: boardSafetyCounts(state.value).acceptedText,
    };
  });
  /** Where the headline figures' year comes from, in words; and its basis. */
  protected readonly yearSource = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? boardYearSource(state.value) : '';
  });
  protected readonly yearBasis = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? boardYear(state.value).basis : null;
  });
  /** The four headline figures, worded as in the PDF; placeholder factors say so beside the value. */
  protected readonly headline = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? boardFigures(state.value) : [];
  });

  /** "Try again" after the summary failed to load. */
  protected load(): void {
    this.summaryLoad.reload();
  }

  protected print(): void {
    window.print();
  }

  protected energy(kWh: number): string {
    return formatBoardEnergy(kWh);
  }

  protected number(value: number): string {
    return formatBoardNumber(value);
  }

  protected stretch(fromM: number, toM: number): string {
    return formatStretch(fromM, toM, this.units());
  }
}
