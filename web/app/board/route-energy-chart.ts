import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, viewChild } from '@angular/core';
import {
  BarController,
  BarElement,
  CategoryScale,
  Legend,
  LinearScale,
  Tooltip,
  type ChartComponentLike,
  type ChartConfiguration,
} from 'chart.js';
import type { RouteYear } from '@shared/domain/board-summary';
import { BaseChartDirective, provideCharts } from 'ng2-charts';
import { formatBoardEnergy, formatBoardNumber } from './board-format';

/** Only the chart.js parts a grouped horizontal bar chart needs. */
const BAR_CHART_PARTS: ChartComponentLike[] = [BarController, BarElement, CategoryScale, LinearScale, Tooltip, Legend];

/** Recovered: our slate-teal; into the friction brakes: warm rust. */
const RECOVERED_COLOR = '#0b5567';
const FRICTION_COLOR = '#c2570c';

/** Per route: braking energy recovered a year beside the energy the friction brakes still turn into heat. */
@Component({
  selector: 'app-route-energy-chart',
  imports: [BaseChartDirective],
  providers: [provideCharts({ registerables: BAR_CHART_PARTS })],
  template: `
    <div class="chart-box" [style.height.px]="heightPx()">
      <canvas baseChart type="bar" role="img" [attr.aria-label]="ariaText()" [data]="data()" [options]="options"></canvas>
    </div>
  `,
  styles: `
    :host {
      display: block;
    }
    .chart-box {
      position: relative;
      width: 100%;
    }
    @media print {
      .chart-box {
        width: 100% !important;
        break-inside: avoid;
      }
      canvas {
        max-width: 100% !important;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteEnergyChart {
  readonly routes = input.required<readonly RouteYear[]>();

  private readonly chart = viewChild(BaseChartDirective);

  /** One bar pair per route, room for the labels. */
  protected readonly heightPx = computed(() => Math.max(160, 70 + this.routes().length * 56));
  protected readonly ariaText = computed(
    () =>
      'Bar chart, per route, of braking energy recovered and energy into the friction brakes per year: ' +
      this.routes()
        .map(
          (route) =>
            `${route.routeName}: ${formatBoardEnergy(route.annualRegenKWh)} recovered, ${formatBoardEnergy(route.annualFrictionBrakeKWh)} into the friction brakes`,
        )
        .join('; '),
  );
  protected readonly data = computed<ChartConfiguration<'bar'>['data']>(() => ({
    // Long route names wrap onto short lines so a narrow screen shows them whole.
    labels: this.routes().map((route) => wrapLabel(route.routeName, 22)),
    datasets: [
      {
        label: 'Recovered by regeneration (kWh a year)',
        data: this.routes().map((route) => route.annualRegenKWh),
        backgroundColor: RECOVERED_COLOR,
        borderRadius: 3,
      },
      {
        label: 'Into the friction brakes (kWh a year)',
        data: this.routes().map((route) => route.annualFrictionBrakeKWh),
        backgroundColor: FRICTION_COLOR,
        borderRadius: 3,
      },
    ],
  }));
  protected readonly options: ChartConfiguration<'bar'>['options'] = {
    indexAxis: 'y',
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    plugins: {
      legend: { position: 'bottom', labels: { boxWidth: 14 } },
      tooltip: { callbacks: { label: (item) => `${item.dataset.label ?? ''}: ${formatBoardEnergy(item.parsed.x)}` } },
    },
    scales: {
      x: {
        beginAtZero: true,
        title: { display: true, text: 'kWh per year' },
        ticks: { maxTicksLimit: 4, callback: (value) => formatBoardNumber(Number(value)) },
      },
      y: { ticks: { autoSkip: false } },
    },
  };

  constructor() {
    // Chart.js sizes its canvas to the screen; resize it to the printed page and back.
    const resize = () => this.chart()?.chart?.resize();
    window.addEventListener('beforeprint', resize);
    window.addEventListener('afterprint', resize);
    inject(DestroyRef).onDestroy(() => {
      window.removeEventListener('beforeprint', resize);
      window.removeEventListener('afterprint', resize);
    });
  }
}

/** Splits a label into lines of at most `width` characters at spaces (a word longer stays whole). */
export function wrapLabel(label: string, width: number): string[] {
  const lines: string[] = [];
  for (const word of label.split(' ')) {
    const last = lines.at(-1);
    if (last !== undefined && last.length + 1 + word.length <= width) lines[lines.length - 1] = `${last} ${word}`;
    else lines.push(word);
  }
  return lines;
}
