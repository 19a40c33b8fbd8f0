import { ChangeDetectionStrategy, Component, effect, input, output, untracked, viewChildren } from '@angular/core';
import { FormArray, FormGroup, ReactiveFormsModule, type AbstractControl, type ValidationErrors } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { coordinateRange } from '@shared/presentation/index';
import { parseCoordinate, type LonLat } from '../route-draft';
import { degreesShown } from './cell-format';
import { CellText } from './cell-text';
import { cell, commitCell, showRow, syncRows, type RowForm } from './table-rows';

type Axis = 'lon' | 'lat';

/** A coordinate typed in the table and accepted: WGS 84 degrees, rounded as the table keeps them. */
export interface CoordinateChange {
  index: number;
  axis: Axis;
  degrees: number;
}

/** The route's vertices as a table of WGS 84 degrees, typed over, inserted after and deleted. */
@Component({
  selector: 'app-route-vertex-table',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, CellText],
  templateUrl: './route-vertex-table.html',
  styleUrl: './route-tables.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteVertexTable {
  readonly vertices = input.required<readonly LonLat[]>();
  readonly canEdit = input.required<boolean>();

  readonly coordinateChanged = output<CoordinateChange>();
  readonly startAtCentre = output();
  readonly insertAfter = output<number>();
  readonly remove = output<number>();

  /** One row per vertex: its longitude and latitude as the table prints them. */
  protected readonly rows = new FormArray<RowForm<Axis>>([]);
  protected readonly ranges = { lon: coordinateRange('lon'), lat: coordinateRange('lat') } as const;
  private readonly cells = viewChildren(CellText);

  constructor() {
    effect(() => {
      const shown = this.vertices().map((vertex) => this.texts(vertex));
      untracked(() => syncRows(this.rows, shown, () => this.newRow(), this.typing()));
    });
  }

  protected readonly degreesShown = degreesShown;

  /** A coordinate committed (Enter or leaving the field): a valid one goes to the route, one out of range shows why. */
  protected cellCommitted(index: number, axis: Axis): void {
    const row = this.rows.at(index);
    commitCell(row?.controls[axis], () => {
      const degrees = parseCoordinate(row!.controls[axis].value, axis)!;
      this.coordinateChanged.emit({ index, axis, degrees });
      // Typing the value already there changes nothing: the table prints it its own way again.
      const vertex = this.vertices()[index];
      if (vertex) showRow(row!, this.texts(vertex));
    });
  }

  private newRow(): RowForm<Axis> {
    return new FormGroup({
      lon: cell([coordinateValidator('lon')]),
      lat: cell([coordinateValidator('lat')]),
    });
  }

  private texts(vertex: LonLat): Record<Axis, string> {
    return { lon: degreesShown(vertex[0]), lat: degreesShown(vertex[1]) };
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

/** A longitude or latitude the draft accepts (`parseCoordinate`): `{ coordinate: true }` otherwise. */
function coordinateValidator(axis: Axis) {
  return (control: AbstractControl<string>): ValidationErrors | null =>
    parseCoordinate(control.value, axis) === null ? { coordinate: true } : null;
}
