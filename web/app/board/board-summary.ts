import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { RiskLevel } from '@shared/domain/analysis';
import type { BoardSummary } from '@shared/domain/board-summary';
import { describeApiError } from '../core/api-error-message';
import { RiskChip } from '../ui/risk-chip';
import { RISK_STYLES } from '@shared/presentation/index';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { BoardAnnualBasis } from './board-annual-basis';
import { BOARD_SUMMARY_PDF_URL, BoardApi } from './board-api';
import { formatBoardCo2, formatBoardEnergy, formatBoardMoney, formatBoardNumber, formatTariff } from './board-format';
import { RouteEnergyChart } from './route-energy-chart';
import { DIRECTION_LABELS, boardFigures, boardSafetyCounts, formatStretch } from '@shared/presentation/index';

type LoadState = { status: 'loading' } | { status: 'error'; message: string } | { status: 'ready'; summary: BoardSummary };

/** Open safety items, worst first. */
const OPEN_ITEM_LEVELS: readonly Exclude<RiskLevel, 'low'>[] = ['critical', 'high', 'elevated'];

/** The board's one page about the whole network; printable on A4 and downloadable as PDF. */
@Component({
  selector: 'app-board-summary',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, RiskChip, RouteEnergyChart, QuantityPipe, BoardAnnualBasis],
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
  protected readonly state = signal<LoadState>({ status: 'loading' });

  protected readonly generatedAt = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.summary.generatedAt : null;
  });
  protected readonly figures = computed(() => {
    const state = this.state();
    if (state.status !== 'ready') return null;
    const { totals, settings, openSafetyItems } = state.summary;
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
      acceptedTotal: boardSafetyCounts(state.summary).accepted,
      acceptedText: boardSafetyCounts(state.summary).acceptedText,
    };
  });
  /** The four headline figures, worded as in the PDF; placeholder factors say so beside the value. */
  protected readonly headline = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? boardFigures(state.summary) : [];
  });

  constructor() {
    void this.load();
  }

  protected async load(): Promise<void> {
    this.state.set({ status: 'loading' });
    try {
      this.state.set({ status: 'ready', summary: await this.boardApi.summary() });
    } catch (error: unknown) {
      // Expected: server unreachable or an answer that fails the shared schema.
      this.state.set({ status: 'error', message: describeApiError(error) });
    }
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
