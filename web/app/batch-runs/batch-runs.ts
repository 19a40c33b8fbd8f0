import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { describeApiError } from '../core/api-error-message';
import { BATCH_STATUS_ICONS, RUN_STATUS_LABELS, batchProgressPercent } from './batch-run-status';
import { BatchRunsApi, type BatchRunSummary } from './batch-runs-api';
import type { LoadState } from '../ui/load-state';

/** The analyst's network-wide re-runs: start one, see the earlier ones. */
@Component({
  selector: 'app-batch-runs',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule],
  template: `
    <section class="app-page" aria-labelledby="batch-title">
      <h1 id="batch-title" class="app-page-title">Network runs</h1>
      <p class="app-lead">
        Re-run every scenario marked “in service” in one go, for example after a vehicle profile, the terrain or the engine changed. The
        board summary and the descent review are updated from the new results.
      </p>
      <div class="start">
        <button matButton="filled" type="button" [disabled]="starting()" (click)="start()">
          <mat-icon>play_arrow</mat-icon>Re-run all in-service scenarios
        </button>
        @if (starting()) {
          <span role="status">Queuing the scenarios…</span>
        }
      </div>
      @if (startError(); as message) {
        <p class="app-inline-error" role="alert"><mat-icon>error</mat-icon>{{ message }}</p>
      }

      <h2 class="section-title">Earlier runs</h2>
      @let state = loadState();
      @if (state.status === 'loading') {
        <mat-progress-bar mode="indeterminate" aria-label="Loading network runs" />
      } @else if (state.status === 'error') {
        <p class="app-inline-error" role="alert">
          <mat-icon>error</mat-icon>{{ state.message }}
          <button matButton type="button" (click)="load()">Try again</button>
        </p>
      } @else if (runs().length === 0) {
        <p class="empty">No network run yet.</p>
      } @else {
        <ul class="runs" aria-label="Network runs">
          @for (run of runs(); track run.id) {
            <li>
              <a class="run" [routerLink]="['/batch-runs', run.id]">
                <mat-icon [class]="'status-' + run.status" aria-hidden="true">{{ icons[run.status] }}</mat-icon>
                <span class="run-main">
                  <span class="run-title">{{ run.createdAt | date: 'd MMM y, HH:mm' }} · {{ runLabels[run.status] }}</span>
                  <span class="run-meta">
                    Started by {{ run.startedBy }} · {{ run.done }} of {{ run.total }} done
                    @if (run.failed > 0) {
                      · <strong class="failed">{{ run.failed }} failed</strong>
                    }
                  </span>
                </span>
                <span class="run-progress">
                  <mat-progress-bar mode="determinate" [value]="progress(run)" [attr.aria-label]="'Progress ' + progress(run) + ' %'" />
                </span>
              </a>
            </li>
          }
        </ul>
      }
    </section>
  `,
  styles: `
    .start {
      display: flex;
      align-items: center;
      gap: 12px;
      flex-wrap: wrap;
      margin: 0 0 16px;
    }
    .section-title {
      font: var(--mat-sys-title-large);
      margin: 24px 0 12px;
    }
    .empty {
      color: var(--mat-sys-on-surface-variant);
    }
    .runs {
      list-style: none;
      margin: 0;
      padding: 0;
      display: grid;
      gap: 8px;
    }
    .run {
      display: grid;
      grid-template-columns: auto 1fr minmax(120px, 200px);
      align-items: center;
      gap: 12px;
      padding: 12px 16px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-medium);
      color: inherit;
      text-decoration: none;
    }
    .run:hover {
      background: var(--mat-sys-surface-container-low);
    }
    .run-main {
      display: flex;
      flex-direction: column;
      gap: 2px;
    }
    .run-title {
      font: var(--mat-sys-title-small);
    }
    .run-meta {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .failed {
      color: var(--mat-sys-error);
    }
    .status-done {
      color: var(--mat-sys-primary);
    }
    .status-running {
      color: var(--mat-sys-tertiary);
    }
    @media (max-width: 600px) {
      .run {
        grid-template-columns: auto 1fr;
      }
      .run-progress {
        grid-column: 1 / -1;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class BatchRuns {
  private readonly batchRunsApi = inject(BatchRunsApi);
  private readonly router = inject(Router);

  protected readonly runLabels = RUN_STATUS_LABELS;
  protected readonly icons = BATCH_STATUS_ICONS;
  protected readonly runs = signal<BatchRunSummary[]>([]);
  protected readonly loadState = signal<LoadState>({ status: 'loading' });
  protected readonly starting = signal(false);
  protected readonly startError = signal<string | null>(null);

  constructor() {
    void this.load();
  }

  protected async load(): Promise<void> {
    this.loadState.set({ status: 'loading' });
    try {
      const runs = await this.batchRunsApi.list();
      this.runs.set([...runs].sort((a, b) => Date.parse(b.createdAt) - Date.parse(a.createdAt)));
      this.loadState.set({ status: 'ready' });
    } catch (error: unknown) {
      // Expected: server unreachable or an answer that fails the shared schema.
      this.loadState.set({ status: 'error', message: describeApiError(error) });
    }
  }

  protected async start(): Promise<void> {
    this.starting.set(true);
    this.startError.set(null);
    try {
      const run = await this.batchRunsApi.start();
      await this.router.navigate(['/batch-runs', run.id]);
    } catch (error: unknown) {
      // Expected: 409 while another network run is still going, or no scenario in service.
      this.startError.set(describeApiError(error));
    } finally {
      this.starting.set(false);
    }
  }

  protected progress(run: BatchRunSummary): number {
    return batchProgressPercent(run);
  }
}
