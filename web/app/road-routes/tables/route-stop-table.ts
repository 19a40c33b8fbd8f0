import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { toDisplay, unitLabel, type UnitSystem } from '@shared/presentation/index';
import type { DraftStop } from '../route-draft';

/** One field of a stop as typed in the table; the editor checks it before it becomes an edit. */
export type StopChange = { index: number } & (
  { field: 'name'; text: string } | { field: 'position'; text: string } | { field: 'dwell'; text: string }
);

/** The route's stops: name, position along the route (in the shown unit) and dwell time. */
@Component({
  selector: 'app-route-stop-table',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './route-stop-table.html',
  styleUrl: './route-tables.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteStopTable {
  readonly stops = input.required<readonly DraftStop[]>();
  readonly canEdit = input.required<boolean>();
  readonly units = input.required<UnitSystem>();

  readonly changed = output<StopChange>();
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
}
