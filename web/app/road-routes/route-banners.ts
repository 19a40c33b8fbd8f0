import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { LoadState } from '../ui/load-state';
import type { RouteProfile } from './road-routes-api';

/** The route's elevation profile: nothing to ask for yet (under two vertices), or its load. */
export type RouteProfileState = { status: 'idle' } | LoadState<RouteProfile>;

/** Says that an older version is on screen (read-only) and offers the way back. */
@Component({
  selector: 'app-route-version-banner',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <p class="app-notice" role="status">
      <mat-icon>history</mat-icon>
      <span>
        You are looking at version {{ version() }} (read-only).
        <button matButton type="button" (click)="backToCurrent.emit()">Back to the current version</button>
      </span>
    </p>
  `,
  styles: `
    :host {
      display: contents;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteVersionBanner {
  /** The older version shown. */
  readonly version = input.required<number>();
  /** Asked for by "Back to the current version". */
  readonly backToCurrent = output();
}

/**
 * Under the elevation profile: where the elevations come from, whether the profile is being
 * worked out or failed, and whether part of the route lies outside every terrain model.
 */
@Component({
  selector: 'app-route-elevation-banners',
  imports: [MatButtonModule, MatIconModule, MatProgressBarModule],
  template: `
    @let state = elevation();
    @let kept = recorded();
    @if (kept.recorded > 0) {
      <p class="elevation-source" data-testid="elevation-source">
        <mat-icon inline>height</mat-icon>
        @if (kept.recorded === kept.total) {
          Elevations: the route’s own, recorded at every vertex (for example by the GPS track it was imported from).
          @if (canEdit()) {
            <button matButton type="button" (click)="useTerrain.emit()">Use the terrain’s instead</button>
          }
        } @else {
          {{ kept.recorded }} of {{ kept.total }} vertices keep a recorded elevation; the edited ones have none, so the terrain supplies
          every elevation. Undo the edit to keep the recorded ones.
        }
      </p>
    } @else if (state.status === 'ready' && state.value.elevationSource === 'terrain') {
      <p class="elevation-source" data-testid="elevation-source">
        <mat-icon inline>landscape</mat-icon> Elevations: from the terrain models.
      </p>
    }
    @if (state.status === 'idle') {
      <p class="hint">The elevation profile appears once the route has two vertices.</p>
    } @else if (state.status === 'loading') {
      <mat-progress-bar mode="indeterminate" aria-label="Updating the elevation profile" />
    } @else if (state.status === 'error') {
      <p class="app-inline-error" role="alert">{{ state.message }}</p>
    }
    @if (terrainGaps()) {
      <p class="app-notice">Part of the route has no terrain model under it; upload terrain covering it before running scenarios.</p>
    }
  `,
  styles: `
    :host {
      display: contents;
    }
    .hint {
      margin: 0 0 8px;
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-medium);
    }
    .elevation-source {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 8px;
      margin: 4px 0;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteElevationBanners {
  /** The profile's load. */
  readonly elevation = input.required<RouteProfileState>();
  /** How many of the vertices keep a recorded elevation, of how many. */
  readonly recorded = input.required<{ recorded: number; total: number }>();
  /** Whether this person may switch the route to the terrain's elevations. */
  readonly canEdit = input(false);
  /** Part of the route has no terrain model under it. */
  readonly terrainGaps = input(false);
  /** Asked for by "Use the terrain’s instead". */
  readonly useTerrain = output();
}
