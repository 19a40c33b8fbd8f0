import { ChangeDetectionStrategy, Component, computed, effect, input, output, untracked, viewChild } from '@angular/core';
import type { ChartConfiguration, ChartDataset, Plugin, ScriptableLineSegmentContext } from 'chart.js';
import { BaseChartDirective, provideCharts } from 'ng2-charts';
import { CHART_PARTS } from './chart-parts';
import { withAlpha } from './chart-colour';

/** One line on a chart along the route; x values in the displayed distance unit. */
export interface ChartSeries {
  label: string;
  x: readonly number[];
  y: readonly (number | null)[];
  color: string;
  /** Fill down to zero (an area), optionally coloured per segment (e.g. by grade class). */
  fill?: boolean;
  /** Fill colour of the segment starting at each point (same length as x). */
  segmentFill?: readonly string[];
  dashed?: boolean;
  /** Put the series on the right-hand axis. */
  rightAxis?: boolean;
}

/** A shaded horizontal band, e.g. a brake-temperature risk band. */
export interface ChartBand {
  from: number;
  to: number;
  color: string;
  label: string;
}

/** Most points a line keeps: enough for a screen-wide chart, light enough to redraw on hover. */
const MAX_POINTS_PER_SERIES = 900;

/**
 * A line chart along the route (distance on x). Several of these are linked: each reports the
 * distance under the pointer (`hovered`) and draws a cursor line at `cursorX`, so hovering one
 * chart marks the same place on the others and on the map.
 */
@Component({
  selector: 'app-distance-chart',
  imports: [BaseChartDirective],
  providers: [provideCharts({ registerables: CHART_PARTS })],
  template: `
    <figure>
      <figcaption>{{ caption() }}</figcaption>
      <div class="canvas-box" [style.height.px]="heightPx()">
        <canvas
          baseChart
          type="line"
          role="img"
          [attr.aria-label]="caption() + ': ' + summaryText()"
          [data]="data()"
          [options]="options()"
          [plugins]="plugins"
        ></canvas>
      </div>
    </figure>
  `,
  styles: `
    :host {
      display: block;
    }
    figure {
      margin: 0;
    }
    figcaption {
      font: var(--mat-sys-title-small);
      margin: 0 0 4px;
      color: var(--mat-sys-on-surface);
    }
    .canvas-box {
      position: relative;
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DistanceChart {
  /** Title above the chart, also its accessible name. */
  readonly caption = input.required<string>();
  readonly series = input.required<readonly ChartSeries[]>();
  readonly xLabel = input('Distance');
  readonly yLabel = input('');
  readonly yRightLabel = input('');
  readonly bands = input<readonly ChartBand[]>([]);
  /** Distance (display unit) where the linked cursor stands; null hides it. */
  readonly cursorX = input<number | null>(null);
  readonly heightPx = input(200);
  /** Whether the y axis starts at zero. */
  readonly yFromZero = input(false);

  /** Emits the distance under the pointer (display unit), or null when the pointer leaves. */
  readonly hovered = output<number | null>();

  private readonly chartDirective = viewChild(BaseChartDirective);
  private cursorValue: number | null = null;

  protected readonly plugins: Plugin<'line'>[] = [this.bandsPlugin(), this.cursorPlugin()];

  protected readonly summaryText = computed(() =>
    this.series()
      .map((line) => line.label)
      .join(', '),
  );

  protected readonly data = computed<ChartConfiguration<'line'>['data']>(() => ({
    datasets: this.series().map((line) => toDataset(line)),
  }));

  protected readonly options = computed<ChartConfiguration<'line'>['options']>(() => {
    const hasRight = this.series().some((line) => line.rightAxis);
    return {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      parsing: false,
      normalized: true,
      interaction: { mode: 'nearest', axis: 'x', intersect: false },
      plugins: {
        legend: { display: this.series().length > 1, position: 'bottom', labels: { boxWidth: 14 } },
        tooltip: {
          callbacks: {
            title: (items) => (items[0] ? `${formatTick(items[0].parsed.x ?? 0)} ${this.xLabel()}` : ''),
          },
        },
      },
      elements: { point: { radius: 0, hoverRadius: 3 }, line: { borderWidth: 2, tension: 0 } },
      scales: {
        x: {
          type: 'linear',
          title: { display: true, text: this.xLabel() },
          ticks: { maxTicksLimit: 10 },
        },
        y: {
          type: 'linear',
          beginAtZero: this.yFromZero(),
          title: { display: !!this.yLabel(), text: this.yLabel() },
        },
        ...(hasRight
          ? {
              y1: {
                type: 'linear' as const,
                position: 'right' as const,
                title: { display: true, text: this.yRightLabel() },
                grid: { drawOnChartArea: false },
              },
            }
          : {}),
      },
      onHover: (event, _elements, chart) => {
        const scale = chart.scales['x'];
        if (!scale || event.x === null || event.type === 'mouseout') {
          this.hovered.emit(null);
          return;
        }
        const inside = event.x >= chart.chartArea.left && event.x <= chart.chartArea.right;
        this.hovered.emit(inside ? (scale.getValueForPixel(event.x) ?? null) : null);
      },
    };
  });

  constructor() {
    effect(() => {
      const x = this.cursorX();
      untracked(() => {
        this.cursorValue = x;
        // Only the overlay changes: redraw without recomputing the layout or the data.
        this.chartDirective()?.chart?.draw();
      });
    });
  }

  private cursorPlugin(): Plugin<'line'> {
    return {
      id: 'descentryCursor',
      afterDatasetsDraw: (chart) => {
        const x = this.cursorValue;
        const scale = chart.scales['x'];
        if (x === null || !scale) return;
        const pixel = scale.getPixelForValue(x);
        const { top, bottom, left, right } = chart.chartArea;
        if (pixel < left || pixel > right) return;
        const ctx = chart.ctx;
        ctx.save();
        ctx.strokeStyle = '#b3261e';
        ctx.lineWidth = 1.5;
        ctx.beginPath();
        ctx.moveTo(pixel, top);
        ctx.lineTo(pixel, bottom);
        ctx.stroke();
        ctx.restore();
      },
    };
  }

  private bandsPlugin(): Plugin<'line'> {
    return {
      id: 'descentryBands',
      beforeDatasetsDraw: (chart) => {
        const scale = chart.scales['y'];
        if (!scale) return;
        const { left, right, top, bottom } = chart.chartArea;
        const ctx = chart.ctx;
        ctx.save();
        for (const band of this.bands()) {
          const y1 = Math.max(top, Math.min(bottom, scale.getPixelForValue(band.to)));
          const y2 = Math.max(top, Math.min(bottom, scale.getPixelForValue(band.from)));
          if (y2 - y1 <= 0) continue;
          ctx.fillStyle = band.color;
          ctx.fillRect(left, y1, right - left, y2 - y1);
          ctx.fillStyle = '#3f484a';
          ctx.font = '11px "Noto Sans", sans-serif';
          if (y2 - y1 > 12) ctx.fillText(band.label, left + 6, y1 + 12);
        }
        ctx.restore();
      },
    };
  }
}

function toDataset(line: ChartSeries): ChartDataset<'line'> {
  const step = Math.max(1, Math.ceil(line.x.length / MAX_POINTS_PER_SERIES));
  const points: { x: number; y: number }[] = [];
  const fills: string[] = [];
  for (let i = 0; i < line.x.length; i += step) {
    const y = line.y[i];
    points.push({ x: line.x[i]!, y: y ?? Number.NaN });
    if (line.segmentFill) fills.push(line.segmentFill[i] ?? 'transparent');
  }
  // Keep the last point so the line reaches the end of the route.
  const last = line.x.length - 1;
  if (last > 0 && last % step !== 0) {
    points.push({ x: line.x[last]!, y: line.y[last] ?? Number.NaN });
    if (line.segmentFill) fills.push(line.segmentFill[last] ?? 'transparent');
  }
  return {
    label: line.label,
    data: points,
    borderColor: line.color,
    backgroundColor: line.fill ? withAlpha(line.color, 0.18) : line.color,
    fill: line.fill ? 'origin' : false,
    borderDash: line.dashed ? [6, 4] : undefined,
    yAxisID: line.rightAxis ? 'y1' : 'y',
    spanGaps: false,
    segment: line.segmentFill
      ? { backgroundColor: (ctx: ScriptableLineSegmentContext) => fills[ctx.p0DataIndex] ?? 'transparent' }
      : undefined,
  };
}

function formatTick(value: number): string {
  return value.toLocaleString('en-GB', { maximumFractionDigits: 2 });
}
