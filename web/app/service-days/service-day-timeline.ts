import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { formatServiceTime } from '@shared/presentation/index';
import { timelinePercent, timelineSpan, type TimelineRow } from './service-day-timeline-model';

/**
 * Blocks as a timeline: one row per block, time of day across. Trips are bars from departure to
 * arrival, layovers the gaps between them, charging stops a striped bar under the trips; a block
 * that cannot be worked (after a run) is marked at its name. Clicking a row's name selects the
 * block for editing when `selectable`.
 */
@Component({
  selector: 'app-service-day-timeline',
  template: `
    <div class="app-table-frame timeline-frame">
      <div class="timeline" role="list" [attr.aria-label]="caption()">
        <div class="axis" aria-hidden="true">
          <span class="name-col"></span>
          <div class="track">
            @for (tick of ticks(); track tick.timeS) {
              <span class="tick" [style.left.%]="tick.percent">{{ tick.label }}</span>
            }
          </div>
        </div>
        @for (row of rows(); track row.blockId) {
          <div class="row" role="listitem" [class.selected]="row.blockId === selectedBlockId()" [attr.data-block]="row.blockId">
            @if (selectable()) {
              <button
                type="button"
                class="name-col name"
                (click)="blockSelected.emit(row.blockId)"
                [attr.aria-pressed]="row.blockId === selectedBlockId()"
              >
                {{ row.blockId }}
              </button>
            } @else {
              <span class="name-col name">{{ row.blockId }}</span>
            }
            <div class="track" [attr.aria-label]="describe(row)">
              @for (tick of ticks(); track tick.timeS) {
                <span class="grid" [style.left.%]="tick.percent"></span>
              }
              <span
                class="service"
                [style.left.%]="at(row.pullOutS)"
                [style.width.%]="width(row.pullOutS, row.pullInS)"
                [title]="'In service ' + time(row.pullOutS) + '–' + time(row.pullInS)"
              ></span>
              @for (bar of row.bars; track $index) {
                <span
                  class="bar"
                  [class.trip]="bar.kind === 'trip'"
                  [class.charge]="bar.kind === 'charge'"
                  [style.left.%]="at(bar.startS)"
                  [style.width.%]="width(bar.startS, bar.endS)"
                  [title]="bar.label"
                ></span>
              }
            </div>
            @if (row.feasible === false) {
              <span class="verdict fails">Cannot be worked</span>
            } @else if (row.feasible === true) {
              <span class="verdict ok">Works</span>
            }
          </div>
        }
      </div>
    </div>
    <p class="legend">
      <span class="key trip"></span> Trip <span class="key layover"></span> Layover <span class="key charge"></span> Charging (after a run)
      @if (estimated()) {
        <span class="note">Arrivals are estimated from each route's length; the run uses the engine's running time.</span>
      }
    </p>
  `,
  styles: `
    :host {
      display: block;
    }
    .timeline-frame {
      padding: 8px 12px;
    }
    .timeline {
      min-width: 720px;
    }
    .axis,
    .row {
      display: grid;
      grid-template-columns: 88px 1fr 120px;
      align-items: center;
      gap: 8px;
    }
    .axis {
      height: 20px;
    }
    .row {
      height: 34px;
      border-top: 1px solid var(--mat-sys-outline-variant);
    }
    .row.selected {
      background: var(--mat-sys-secondary-container);
    }
    .track {
      position: relative;
      height: 100%;
    }
    .tick {
      position: absolute;
      top: 0;
      transform: translateX(-50%);
      font: var(--mat-sys-label-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .grid {
      position: absolute;
      top: 0;
      bottom: 0;
      border-left: 1px dotted var(--mat-sys-outline-variant);
    }
    .service {
      position: absolute;
      top: 15px;
      height: 4px;
      background: var(--mat-sys-outline-variant);
      border-radius: 2px;
    }
    .bar {
      position: absolute;
      min-width: 2px;
      border-radius: 3px;
    }
    .bar.trip {
      top: 6px;
      height: 14px;
      background: #0b5567;
    }
    .bar.charge {
      top: 22px;
      height: 8px;
      background: repeating-linear-gradient(135deg, #3f7f4f 0 4px, #a9d3b3 4px 8px);
    }
    .name {
      font: var(--mat-sys-label-large);
      text-align: left;
      overflow: hidden;
      text-overflow: ellipsis;
      white-space: nowrap;
    }
    button.name {
      border: 0;
      background: none;
      padding: 4px 0;
      cursor: pointer;
      color: var(--mat-sys-primary);
      text-decoration: underline;
    }
    .verdict {
      font: var(--mat-sys-label-medium);
    }
    .verdict.fails {
      color: #b3261e;
      font-weight: 600;
    }
    .verdict.ok {
      color: #3f7f4f;
    }
    .legend {
      display: flex;
      flex-wrap: wrap;
      gap: 4px 12px;
      align-items: center;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .key {
      display: inline-block;
      width: 18px;
      height: 10px;
      border-radius: 2px;
      vertical-align: middle;
    }
    .key.trip {
      background: #0b5567;
    }
    .key.layover {
      background: var(--mat-sys-outline-variant);
      height: 4px;
    }
    .key.charge {
      background: repeating-linear-gradient(135deg, #3f7f4f 0 4px, #a9d3b3 4px 8px);
    }
    .note {
      flex-basis: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ServiceDayTimeline {
  readonly rows = input.required<readonly TimelineRow[]>();
  readonly caption = input('Blocks through the day');
  readonly selectedBlockId = input<string | null>(null);
  readonly selectable = input(false);
  /** Whether trip arrivals are estimates (the editor) rather than taken from a run. */
  readonly estimated = input(true);

  readonly blockSelected = output<string>();

  protected readonly span = computed(() => timelineSpan(this.rows()));
  protected readonly ticks = computed(() => {
    const { fromS, toS } = this.span();
    const stepS = toS - fromS > 12 * 3600 ? 2 * 3600 : 3600;
    const ticks: { timeS: number; percent: number; label: string }[] = [];
    for (let timeS = fromS; timeS <= toS; timeS += stepS) ticks.push({ timeS, percent: this.at(timeS), label: formatServiceTime(timeS) });
    return ticks;
  });

  protected at(timeS: number): number {
    return timelinePercent(timeS, this.span());
  }

  protected width(fromS: number, toS: number): number {
    return Math.max(0, this.at(toS) - this.at(fromS));
  }

  protected time(timeS: number): string {
    return formatServiceTime(timeS);
  }

  protected describe(row: TimelineRow): string {
    const trips = row.bars.filter((bar) => bar.kind === 'trip').length;
    const charges = row.bars.filter((bar) => bar.kind === 'charge').length;
    return `Block ${row.blockId}: ${formatServiceTime(row.pullOutS)}–${formatServiceTime(row.pullInS)}, ${trips} trips, ${row.layovers.length} layovers${charges ? `, ${charges} charging stops` : ''}`;
  }
}
