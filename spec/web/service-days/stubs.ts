import { Component, input, output } from '@angular/core';
import type { MapOverlay, MapOverlayEvent, MapPosition } from '../../../web/app/map/terrain-map';
import type { ChartSeries } from '../../../web/app/charts/distance-chart';

/** Stands in for the Leaflet map (jsdom has no layout): the same inputs and outputs, drawn as a list. */
@Component({
  selector: 'app-terrain-map',
  template: `@for (overlay of overlays(); track overlay.id) {
    <span class="overlay" [attr.data-id]="overlay.id"></span>
  }`,
})
export class MapStub {
  readonly ariaLabel = input('');
  readonly overlays = input<readonly MapOverlay[]>([]);
  readonly fitTo = input<readonly MapPosition[] | null>(null);
  readonly cursor = input('');
  readonly placing = input(false);
  readonly highlight = input<MapPosition | null>(null);
  readonly mapClicked = output<MapPosition>();
  readonly overlayMoved = output<MapOverlayEvent>();
  readonly overlayClicked = output<MapOverlayEvent>();
}

/** Stands in for the canvas chart (jsdom has no canvas): lists the series it was given. */
@Component({
  selector: 'app-distance-chart',
  template: `@for (line of series(); track line.label) {
    <span class="series">{{ line.label }}</span>
  }`,
})
export class ChartStub {
  readonly caption = input('');
  readonly series = input<readonly ChartSeries[]>([]);
  readonly xLabel = input('');
  readonly yLabel = input('');
  readonly heightPx = input(200);
  readonly yFromZero = input(false);
}
