import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { COORDINATE_DECIMALS, type LonLat } from '../route-draft';

/** A coordinate typed in the table: the field keeps the typed text until the route shows the result. */
export interface CoordinateTyped {
  index: number;
  axis: 'lon' | 'lat';
  text: string;
  /** Shows the vertex's stored coordinate again (after a refused value). */
  restore: () => void;
}

/** The route's vertices as a table of WGS 84 degrees, typed over, inserted after and deleted. */
@Component({
  selector: 'app-route-vertex-table',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './route-vertex-table.html',
  styleUrl: './route-tables.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteVertexTable {
  readonly vertices = input.required<readonly LonLat[]>();
  readonly canEdit = input.required<boolean>();

  readonly coordinateTyped = output<CoordinateTyped>();
  readonly startAtCentre = output();
  readonly insertAfter = output<number>();
  readonly remove = output<number>();

  protected degreesShown(degrees: number): string {
    return degrees.toFixed(COORDINATE_DECIMALS);
  }

  protected typed(index: number, axis: 'lon' | 'lat', field: HTMLInputElement): void {
    this.coordinateTyped.emit({
      index,
      axis,
      text: field.value,
      restore: () => {
        const vertex = this.vertices()[index];
        if (vertex) field.value = this.degreesShown(vertex[axis === 'lon' ? 0 : 1]);
      },
    });
  }
}
