import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { LoadState } from './load-state';

/**
 * The one way a page shows its loading: a progress bar while loading, the error in words with a
 * "Try again" button when it failed, and the projected content once it is ready.
 */
@Component({
  selector: 'app-load-status',
  imports: [MatButtonModule, MatIconModule, MatProgressBarModule],
  template: `
    @let shown = state();
    @if (shown.status === 'loading') {
      <mat-progress-bar mode="indeterminate" [attr.aria-label]="loadingLabel()" />
    } @else if (shown.status === 'error') {
      <p class="app-inline-error" role="alert">
        <mat-icon>error</mat-icon>{{ shown.message }}
        <button matButton type="button" (click)="retry.emit()">Try again</button>
      </p>
    } @else {
      <ng-content />
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoadStatus {
  // Any `LoadState<T>` fits: the value is not shown here.
  readonly state = input.required<LoadState>();
  /** What the progress bar announces, e.g. "Loading the imports". */
  readonly loadingLabel = input('Loading');
  /** Asked for by "Try again". */
  readonly retry = output();
}
