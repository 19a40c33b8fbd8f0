import { ChangeDetectionStrategy, Component, effect, input, output, untracked, viewChildren } from '@angular/core';
import { FormArray, FormGroup, ReactiveFormsModule, type AbstractControl, type ValidationErrors, type ValidatorFn } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { fromDisplay, speedLimitKphOf, unitLabel, type ShownRange, type UnitSystem } from '@shared/presentation/index';
import type { DraftSpeedLimit } from '../route-draft';
import { CellText } from './cell-text';
import { distanceShown, speedShown } from './cell-format';
import { cell, commitCell, numberIn, numberWithin, showRow, syncRows, type RowForm } from './table-rows';

const LIMIT_COLUMNS = ['fromM', 'toM', 'speedKph'] as const;
type LimitColumn = (typeof LIMIT_COLUMNS)[number];

/**
 * A stretch's ends or limit typed in the table and accepted, in the draft's units (m, km/h): the
 * cell committed, with any other cell of the row typed over and not yet taken (an end refused
 * until the other end was moved).
 */
export interface LimitChange {
  index: number;
  change: Partial<DraftSpeedLimit>;
}

/** The route's speed-limit stretches: where each starts and ends and its limit, in the shown units. */
@Component({
  selector: 'app-route-limit-table',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, CellText],
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

  /** One row per stretch: its ends and limit as the table prints them. */
  protected readonly rows = new FormArray<RowForm<LimitColumn>>([]);
  private readonly cells = viewChildren(CellText);

  constructor() {
    effect(() => {
      const shown = this.stretches().map((stretch) => this.texts(stretch));
      // The limit's range is in the shown unit: a unit switch checks every cell again.
      this.speedRange();
      untracked(() => syncRows(this.rows, shown, () => this.newRow(), this.typing()));
    });
  }

  protected distanceUnit(): string {
    return unitLabel('distance', this.units());
  }

  /** A distance in metres in the shown unit, to the metre, without trailing zeros. */
  protected distanceShown(valueM: number): string {
    return distanceShown(valueM, this.units());
  }

  protected speedUnit(): string {
    return unitLabel('speed', this.units());
  }

  protected speedShown(speedKph: number): string {
    return speedShown(speedKph, this.units());
  }

  /** What is wrong with a cell, in the words its message shows; null when nothing is. */
  protected messageOf(row: RowForm<LimitColumn>, column: LimitColumn): string | null {
    const control = row.controls[column];
    if (!control.touched) return null;
    if (column === 'speedKph') return control.invalid ? this.speedRange().message : null;
    if (control.invalid) return `0 ${this.distanceUnit()} or more.`;
    return column === 'toM' && row.errors?.['order'] ? 'A stretch must end after it starts.' : null;
  }

  /** A cell committed (Enter or leaving it): a valid value goes to the route, an invalid one shows why. */
  protected cellCommitted(index: number, column: LimitColumn): void {
    const row = this.rows.at(index);
    const control = row?.controls[column];
    const applied = commitCell(control, () => {
      const typed = LIMIT_COLUMNS.filter((other) => other === column || row!.controls[other].dirty);
      if (typed.some((other) => row!.controls[other].invalid)) return;
      this.changed.emit({ index, change: Object.fromEntries(typed.map((other) => [other, this.valueOf(row!, other)!])) });
      // A value that changes nothing (the same end typed again) is printed as the table prints it.
      const stretch = this.stretches()[index];
      if (stretch) showRow(row!, this.texts(stretch));
    });
    // An end that does not follow the start is the stretch's problem: the message sits under its end.
    if (!applied && row?.errors?.['order']) row.controls.toM.markAsTouched();
  }

  /** A cell's value in the draft's units: metres to the metre, km/h to 0.1; null when it holds no number. */
  private valueOf(row: RowForm<LimitColumn>, column: LimitColumn): number | null {
    const shown = numberIn(row.controls[column].value);
    if (shown === null) return null;
    if (column === 'speedKph') return speedLimitKphOf(shown, this.units());
    return Math.round(fromDisplay('distance', shown, this.units()));
  }

  private newRow(): RowForm<LimitColumn> {
    const distance = numberWithin(() => ({ min: 0 }));
    return new FormGroup(
      {
        fromM: cell([distance]),
        toM: cell([distance]),
        speedKph: cell([numberWithin(() => this.speedRange())]),
      },
      { validators: [this.endsAfterStart] },
    );
  }

  /** A stretch ends after it starts, in whole metres as the draft keeps them: `{ order: true }` otherwise. */
  private readonly endsAfterStart: ValidatorFn = (group): ValidationErrors | null => {
    const row = group as RowForm<LimitColumn>;
    const fromM = this.valueOf(row, 'fromM');
    const toM = this.valueOf(row, 'toM');
    return fromM === null || toM === null || toM > fromM ? null : { order: true };
  };

  private texts(stretch: DraftSpeedLimit): Record<LimitColumn, string> {
    return { fromM: this.distanceShown(stretch.fromM), toM: this.distanceShown(stretch.toM), speedKph: this.speedShown(stretch.speedKph) };
  }

  /** The cell the person is typing in, if any. */
  private typing(): AbstractControl | null {
    return (
      this.cells()
        .map((field) => field.focusedControl())
        .find((control) => control !== null) ?? null
    );
  }
}
