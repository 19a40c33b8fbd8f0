import { ChangeDetectionStrategy, Component, effect, input, output, untracked, viewChildren } from '@angular/core';
import { FormArray, FormGroup, ReactiveFormsModule, type AbstractControl, type ValidationErrors } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { NAME_MAX_LENGTH } from '@shared/domain/limits';
import { DWELL_RANGE, fromDisplay, unitLabel, type UnitSystem } from '@shared/presentation/index';
import type { DraftStop } from '../route-draft';
import { CellText } from './cell-text';
import { distanceShown } from './cell-format';
import { cell, commitCell, numberIn, numberWithin, showRow, syncRows, type RowForm } from './table-rows';

type StopColumn = 'name' | 'position' | 'dwell';

/** A stop's field typed in the table and accepted, in SI: its name, its distance along the route (m) or its dwell (s). */
export type StopChange = { index: number } & (
  { field: 'name'; name: string } | { field: 'position'; atM: number } | { field: 'dwell'; dwellS: number }
);

/** The route's stops: name, position along the route (in the shown unit) and dwell time. */
@Component({
  selector: 'app-route-stop-table',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, CellText],
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

  /** One row per stop: its name, position and dwell as the table prints them. */
  protected readonly rows = new FormArray<RowForm<StopColumn>>([]);
  protected readonly dwellRange = DWELL_RANGE;
  private readonly cells = viewChildren(CellText);

  constructor() {
    effect(() => {
      const shown = this.stops().map((stop) => this.texts(stop));
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

  /** What is wrong with a cell, in the words its message shows. */
  protected messageOf(column: StopColumn): string {
    if (column === 'name') return `Give the stop a name of at most ${NAME_MAX_LENGTH} characters.`;
    if (column === 'position') return `A distance from the start of the route, 0 ${this.distanceUnit()} or more.`;
    return DWELL_RANGE.message;
  }

  /** A field committed (Enter or leaving it): a valid value goes to the route, an invalid one shows why. */
  protected cellCommitted(index: number, column: StopColumn): void {
    const row = this.rows.at(index);
    commitCell(row?.controls[column], () => {
      const text = row!.controls[column].value;
      if (column === 'name') this.changed.emit({ index, field: 'name', name: text.trim() });
      else if (column === 'position')
        this.changed.emit({ index, field: 'position', atM: fromDisplay('distance', numberIn(text)!, this.units()) });
      else this.changed.emit({ index, field: 'dwell', dwellS: numberIn(text)! });
      // A value that changes nothing (the same name typed again) is printed as the table prints it.
      const stop = this.stops()[index];
      if (stop) showRow(row!, this.texts(stop));
    });
  }

  private newRow(): RowForm<StopColumn> {
    return new FormGroup({
      name: cell([nameValidator]),
      position: cell([numberWithin(() => ({ min: 0 }))]),
      dwell: cell([numberWithin(() => DWELL_RANGE)]),
    });
  }

  private texts(stop: DraftStop): Record<StopColumn, string> {
    return { name: stop.name, position: this.distanceShown(stop.atM), dwell: String(stop.dwellS) };
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

/** A stop's name as the contract takes it: something besides spaces, at most NAME_MAX_LENGTH characters once trimmed. */
function nameValidator(control: AbstractControl<string>): ValidationErrors | null {
  const name = control.value.trim();
  if (name === '') return { required: true };
  return name.length > NAME_MAX_LENGTH ? { maxlength: { requiredLength: NAME_MAX_LENGTH, actualLength: name.length } } : null;
}
