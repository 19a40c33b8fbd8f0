import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { kphToDisplay, toDisplay, unitLabel, type ShownRange, type UnitSystem } from '@shared/presentation/index';
import type { DraftSpeedLimit } from '../route-draft';

/** One end or the speed of a stretch as typed in the table, in the shown units. */
export interface LimitChange {
  index: number;
  field: 'fromM' | 'toM' | 'speedKph';
  text: string;
}

/** The route's speed-limit stretches: where each starts and ends and its limit, in the shown units. */
@Component({
  selector: 'app-route-limit-table',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './route-limit-table.html',
  styleUrl: './route-tables.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteLimitTable {
  readonly stretches = input.required<readonly DraftSpeedLimit[]>();
  readonly canEdit = input.required<boolean>();
  readonly units = input.required<UnitSystem>();
  readonly canAdd = input.required<boolean>();
  readonly speedRange = input.required<ShownRange>();
  /** Speed given to a stretch added from the table, in the shown unit. */
  readonly newSpeed = input.required<number>();

  readonly changed = output<LimitChange>();
  readonly add = output();
  readonly remove = output<number>();

  protected distanceUnit(): string {
    return unitLabel('distance', this.units());
  }

  /** A distance in metres in the shown unit, to the metre, without trailing zeros. */
  protected distanceShown(valueM: number): string {
    return toDisplay('distance', valueM, this.units())
      .toFixed(3)
      .replace(/\.?0+$/, '');
  }

  protected speedUnit(): string {
    return unitLabel('speed', this.units());
  }

  protected speedShown(speedKph: number): string {
    return String(Math.round(kphToDisplay(speedKph, this.units())));
  }
}
