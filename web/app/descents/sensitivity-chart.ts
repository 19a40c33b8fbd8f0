import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { SensitivityEntry, SensitivityInput } from '@shared/domain/analysis';
import {
  RISK_STYLES,
  SENSITIVITY_INPUT_LABELS,
  formatTemperatureLimit,
  formatTemperatureReached,
  toDisplay,
  type UnitSystem,
} from '@shared/presentation/index';

interface Bar {
  input: SensitivityInput;
  label: string;
  range: string;
  dominant: boolean;
  low: string;
  high: string;
  x: number;
  width: number;
  y: number;
  colour: string;
}

const LABEL_WIDTH = 190;
const PLOT_WIDTH = 360;
const ROW_HEIGHT = 30;
const TOP = 26;

/**
 * How far the descent's peak brake temperature moves when one input is moved down and up: one bar
 * per input from the lower to the higher temperature, the widest spread marked, with the fade
 * temperature and the advisory limit (fade minus margin) as vertical lines. The same figures are
 * in a table below the chart for screen readers and for copying.
 */
@Component({
  selector: 'app-sensitivity-chart',
  template: `
    <figure class="figure">
      <figcaption id="{{ id() }}-caption">What moves the peak brake temperature most (regeneration working, hotter brake group)</figcaption>
      <svg
        role="img"
        [attr.aria-labelledby]="id() + '-caption'"
        [attr.aria-describedby]="id() + '-summary'"
        [attr.viewBox]="'0 0 ' + totalWidth + ' ' + height()"
        preserveAspectRatio="xMinYMin meet"
        data-testid="sensitivity-chart"
      >
        @for (bar of bars(); track bar.input) {
          <text class="label" [class.dominant]="bar.dominant" x="0" [attr.y]="bar.y + 15">
            {{ bar.label }}{{ bar.dominant ? ' ◆' : '' }}
          </text>
          <rect
            [attr.x]="bar.x"
            [attr.y]="bar.y + 4"
            [attr.width]="bar.width"
            height="16"
            rx="3"
            [attr.fill]="bar.colour"
            [attr.stroke]="bar.dominant ? '#1b1b1f' : 'none'"
            stroke-width="1.5"
            [attr.data-testid]="'sensitivity-bar-' + bar.input"
          />
        }
        @if (limitX(); as x) {
          <line
            class="limit"
            [attr.stroke]="limitColour"
            [attr.x1]="x"
            [attr.x2]="x"
            [attr.y1]="TOP - 6"
            [attr.y2]="height() - 4"
            data-testid="sensitivity-limit-line"
          />
          <text class="line-label" [attr.x]="x - 4" y="12" text-anchor="end">limit {{ limitText() }}</text>
        }
        <line
          class="fade"
          [attr.stroke]="fadeColour"
          [attr.x1]="fadeX()"
          [attr.x2]="fadeX()"
          [attr.y1]="TOP - 6"
          [attr.y2]="height() - 4"
          data-testid="sensitivity-fade-line"
        />
        <text class="line-label" [attr.x]="fadeX() + 4" y="12">fade {{ fadeText() }}</text>
      </svg>
      <p class="summary" [id]="id() + '-summary'">{{ summary() }}</p>
      <details>
        <summary>The figures</summary>
        <table class="figures" data-testid="sensitivity-table">
          <thead>
            <tr>
              <th scope="col">Input</th>
              <th scope="col">Moved</th>
              <th scope="col" class="num">Peak, low</th>
              <th scope="col" class="num">Peak, high</th>
            </tr>
          </thead>
          <tbody>
            @for (bar of bars(); track bar.input) {
              <tr [class.dominant]="bar.dominant">
                <th scope="row">
                  {{ bar.label }}
                  @if (bar.dominant) {
                    <span class="tag">widest spread</span>
                  }
                </th>
                <td>{{ bar.range }}</td>
                <td class="num">{{ bar.low }}</td>
                <td class="num">{{ bar.high }}</td>
              </tr>
            }
          </tbody>
        </table>
      </details>
    </figure>
  `,
  styles: `
    :host {
      display: block;
    }
    .figure {
      margin: 0;
      display: grid;
      gap: 6px;
    }
    figcaption {
      font: var(--mat-sys-title-small);
    }
    svg {
      width: 100%;
      max-width: 600px;
      height: auto;
      overflow: visible;
    }
    .label {
      font:
        12px 'Noto Sans',
        sans-serif;
      fill: var(--mat-sys-on-surface);
    }
    .label.dominant {
      font-weight: 700;
    }
    .line-label {
      font:
        11px 'Noto Sans',
        sans-serif;
      fill: var(--mat-sys-on-surface-variant);
    }
    .fade,
    .limit {
      stroke-width: 2;
    }
    .limit {
      stroke-dasharray: 5 3;
    }
    .summary {
      margin: 0;
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    details summary {
      cursor: pointer;
      font: var(--mat-sys-label-large);
    }
    .figures {
      border-collapse: collapse;
      margin-top: 6px;
      font: var(--mat-sys-body-small);
    }
    .figures th,
    .figures td {
      text-align: left;
      padding: 4px 8px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .figures .num {
      text-align: right;
      white-space: nowrap;
    }
    .tag {
      margin-left: 6px;
      font-weight: 700;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SensitivityChart {
  readonly entries = input.required<readonly SensitivityEntry[]>();
  readonly dominant = input<SensitivityInput | undefined>(undefined);
  readonly fadeThresholdC = input.required<number>();
  readonly fadeMarginK = input<number | undefined>(undefined);
  readonly units = input.required<UnitSystem>();
  /** Prefix of the element ids (several charts can share a page). */
  readonly id = input('sensitivity');

  protected readonly TOP = TOP;
  protected readonly fadeColour = RISK_STYLES.critical.accent;
  protected readonly limitColour = RISK_STYLES.high.accent;
  protected readonly totalWidth = LABEL_WIDTH + PLOT_WIDTH + 10;
  protected readonly height = computed(() => TOP + this.entries().length * ROW_HEIGHT + 4);

  private readonly limitC = computed(() => {
    const margin = this.fadeMarginK();
    return margin === undefined || margin <= 0 ? null : this.fadeThresholdC() - margin;
  });

  /** Display-unit domain covering every bar and both lines, with a little room either side. */
  private readonly domain = computed(() => {
    const system = this.units();
    const values = this.entries().flatMap((entry) => [entry.lowPeakBrakeTempC, entry.highPeakBrakeTempC]);
    values.push(this.fadeThresholdC());
    const limit = this.limitC();
    if (limit !== null) values.push(limit);
    const shown = values.map((value) => toDisplay('temperature', value, system));
    const min = Math.min(...shown);
    const max = Math.max(...shown);
    const pad = Math.max((max - min) * 0.08, 5);
    return { min: min - pad, max: max + pad };
  });

  private x(temperatureC: number): number {
    const { min, max } = this.domain();
    return LABEL_WIDTH + ((toDisplay('temperature', temperatureC, this.units()) - min) / (max - min)) * PLOT_WIDTH;
  }

  protected readonly fadeX = computed(() => this.x(this.fadeThresholdC()));
  protected readonly limitX = computed(() => {
    const limit = this.limitC();
    return limit === null ? null : this.x(limit);
  });
  protected readonly fadeText = computed(() => formatTemperatureLimit(this.fadeThresholdC(), this.units()));
  protected readonly limitText = computed(() => {
    const limit = this.limitC();
    return limit === null ? '' : formatTemperatureLimit(limit, this.units());
  });

  protected readonly bars = computed<Bar[]>(() => {
    const system = this.units();
    const limit = this.limitC() ?? this.fadeThresholdC();
    return this.entries().map((entry, index) => {
      const lower = Math.min(entry.lowPeakBrakeTempC, entry.highPeakBrakeTempC);
      const higher = Math.max(entry.lowPeakBrakeTempC, entry.highPeakBrakeTempC);
      const x = this.x(lower);
      const level = higher >= this.fadeThresholdC() ? 'critical' : higher >= limit ? 'high' : 'low';
      return {
        input: entry.input,
        label: SENSITIVITY_INPUT_LABELS[entry.input].label,
        range: SENSITIVITY_INPUT_LABELS[entry.input].range,
        dominant: entry.input === this.dominant(),
        low: formatTemperatureReached(entry.lowPeakBrakeTempC, system),
        high: formatTemperatureReached(entry.highPeakBrakeTempC, system),
        x,
        width: Math.max(this.x(higher) - x, 2),
        y: TOP + index * ROW_HEIGHT,
        colour: RISK_STYLES[level].accent,
      };
    });
  });

  protected readonly summary = computed(() => {
    const dominant = this.bars().find((bar) => bar.dominant);
    const limit = this.limitText();
    return (
      (dominant ? `${dominant.label} moves the peak most (${dominant.low} to ${dominant.high}). ` : '') +
      `Fade starts near ${this.fadeText()}` +
      (limit ? `; the advice keeps the brakes at or below ${limit}.` : '.')
    );
  });
}
