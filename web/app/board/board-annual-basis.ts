import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { AnnualBasis } from '@shared/domain/board-summary';
import {
  DAY_TYPE_LABELS,
  SEASON_LABELS,
  formatBoardCo2,
  formatBoardEnergy,
  formatBoardMoney,
  formatBoardNumber,
} from '@shared/presentation/index';

/**
 * The board page's year on one stated basis: which basis in plain words, the service days it
 * counts with their days per year, the CO₂ baseline it compares against and its source, the
 * charging peaks per depot and terminus, and what moves the annual figures most.
 */
@Component({
  selector: 'app-board-annual-basis',
  imports: [MatIconModule, RouterLink],
  template: `
    @let a = annual();
    <section class="block" aria-labelledby="basis-title" data-testid="annual-basis">
      <h2 id="basis-title" class="section-title">How the year is counted</h2>
      <p class="basis-text" data-testid="basis-text">{{ a.basisText }}</p>
      @if (a.serviceDays.length > 0) {
        <div class="app-table-frame">
          <table class="basis-table" aria-label="Service days counted in the year">
            <thead>
              <tr>
                <th scope="col">Service day</th>
                <th scope="col">Kind of day</th>
                <th scope="col" class="num">Days a year</th>
                <th scope="col" class="num">Grid energy a day</th>
                <th scope="col" class="num">Distance a day</th>
                <th scope="col">Note</th>
              </tr>
            </thead>
            <tbody>
              @for (day of a.serviceDays; track day.id) {
                <tr>
                  <td>
                    <a [routerLink]="['/service-days', day.id]">{{ day.name }}</a>
                  </td>
                  <td>{{ dayTypeLabels[day.dayType] }}, {{ seasonLabels[day.season].toLowerCase() }}</td>
                  <td class="num">{{ day.daysPerYear }}</td>
                  <td class="num">{{ energy(day.dayGridEnergyKWh) }}</td>
                  <td class="num">{{ number(day.dayKm) }} km</td>
                  <td>
                    @if (day.infeasibleBlocks > 0) {
                      <span class="warn"
                        >{{ day.infeasibleBlocks }} {{ day.infeasibleBlocks === 1 ? 'block' : 'blocks' }} cannot be worked</span
                      >
                    }
                    @if (day.isStale) {
                      <span class="stale">out of date</span>
                    }
                  </td>
                </tr>
              }
            </tbody>
          </table>
        </div>
      }
      @if (a.notCovered.length > 0) {
        <p class="note"><mat-icon inline>info</mat-icon> Counted as no service (no in-service run): {{ notCoveredText() }}.</p>
      }

      <h3 class="sub-title">CO₂ against the vehicle it replaces</h3>
      <p data-testid="co2-baseline">
        Driving the same {{ number(a.annualKm) }} km a year with a {{ a.baseline.name }} ({{ consumption() }},
        {{ a.baseline.emissionFactorKgPerUnit }} kg CO₂ per {{ a.baseline.consumptionUnit === 'l-diesel' ? 'litre' : 'kWh' }}) would emit
        {{ co2(a.baseline.co2Kg) }}; the electric network's grid energy emits {{ co2(a.co2Kg) }}:
        <strong>{{ co2(a.baseline.co2SavedKg) }} less a year</strong>.
      </p>
      <p class="source">Source of the reference vehicle: {{ a.baseline.source }}</p>

      @if (a.peakCharging.length > 0) {
        <h3 class="sub-title">Charging power the grid must supply</h3>
        <div class="app-table-frame">
          <table class="basis-table" aria-label="Peak charging power per charger site" data-testid="board-peak-charging">
            <thead>
              <tr>
                <th scope="col">Charger</th>
                <th scope="col">Kind</th>
                <th scope="col" class="num">Peak during the day</th>
                <th scope="col" class="num">Peak overnight</th>
              </tr>
            </thead>
            <tbody>
              @for (peak of a.peakCharging; track peak.chargerKey) {
                <tr>
                  <td>{{ peak.chargerName }}</td>
                  <td>{{ peak.kind === 'depot' ? 'Depot' : 'Terminus' }}</td>
                  <td class="num">{{ kw(peak.daytimePeakW) }}</td>
                  <td class="num">{{ peak.overnightPeakW === null ? '—' : kw(peak.overnightPeakW) }}</td>
                </tr>
              }
            </tbody>
          </table>
        </div>
        <p class="note">Overnight at a depot: every vehicle returning there charging at once, an upper bound for the connection.</p>
      }

      @if (a.sensitivity.length > 0) {
        <h3 class="sub-title">What moves the year's figures most</h3>
        <div class="app-table-frame">
          <table class="basis-table" aria-label="Sensitivity of the annual figures" data-testid="sensitivity-table">
            <thead>
              <tr>
                <th scope="col">Factor</th>
                <th scope="col">Change</th>
                <th scope="col" class="num">Energy cost a year</th>
                <th scope="col" class="num">CO₂ saved a year</th>
              </tr>
            </thead>
            <tbody>
              @for (row of a.sensitivity; track $index) {
                <tr>
                  <td>{{ row.factor }}</td>
                  <td>{{ row.change }}</td>
                  <td class="num">{{ signed(money(row.energyCostDelta), row.energyCostDelta) }}</td>
                  <td class="num">{{ signed(co2(row.co2SavedDeltaKg), row.co2SavedDeltaKg) }}</td>
                </tr>
              }
            </tbody>
          </table>
        </div>
        <p class="note">{{ a.sensitivityMethod }}</p>
      }
    </section>
  `,
  styles: `
    .basis-text {
      font: var(--mat-sys-body-large);
    }
    .sub-title {
      margin: 20px 0 6px;
      font: var(--mat-sys-title-small);
    }
    .basis-table {
      width: 100%;
      border-collapse: collapse;
      font: var(--mat-sys-body-medium);
    }
    .basis-table th,
    .basis-table td {
      padding: 6px 10px;
      text-align: left;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .basis-table th {
      font: var(--mat-sys-title-small);
    }
    .num {
      text-align: right !important;
      white-space: nowrap;
    }
    .warn {
      color: #b3261e;
      font-weight: 600;
      margin-right: 8px;
    }
    .stale {
      color: var(--mat-sys-tertiary);
    }
    .note,
    .source {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BoardAnnualBasis {
  readonly annual = input.required<AnnualBasis>();
  readonly currency = input.required<string>();

  protected readonly dayTypeLabels = DAY_TYPE_LABELS;
  protected readonly seasonLabels = SEASON_LABELS;

  protected readonly consumption = computed(() => {
    const baseline = this.annual().baseline;
    return baseline.consumptionUnit === 'l-diesel'
      ? `${formatBoardNumber(baseline.consumptionPerKm * 100)} l of diesel per 100 km`
      : `${formatBoardNumber(baseline.consumptionPerKm)} kWh per km`;
  });

  protected readonly notCoveredText = computed(() =>
    this.annual()
      .notCovered.map(
        (item) => `${DAY_TYPE_LABELS[item.dayType]} in ${SEASON_LABELS[item.season].toLowerCase()} (${item.daysPerYear} days)`,
      )
      .join(', '),
  );

  protected energy(kWh: number): string {
    return formatBoardEnergy(kWh);
  }

  protected number(value: number): string {
    return formatBoardNumber(value);
  }

  protected co2(kg: number): string {
    return formatBoardCo2(kg);
  }

  protected money(amount: number): string {
    return formatBoardMoney(amount, this.currency());
  }

  protected kw(powerW: number): string {
    return `${formatBoardNumber(powerW / 1000)} kW`;
  }

  /** "+€1,200" / "−340 t": a change with its sign (the true minus sign). */
  protected signed(text: string, value: number): string {
    if (value > 0) return `+${text}`;
    return value < 0 ? `\u2212${text.replace(/^[-\u2212]/, '')}` : text;
  }
}
