import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { BatchRun } from '@shared/domain/board-summary';
import { describeApiError } from '../core/api-error-message';
import { pollBatchRun, type BatchRunPoller } from './batch-run-poller';
import { BATCH_STATUS_ICONS, BATCH_STATUS_LABELS, RUN_STATUS_LABELS, batchProgressPercent } from './batch-run-status';
import { BatchRunsApi } from './batch-runs-api';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';

/** One network run: progress while it runs (asked every 1.5 s), then each scenario's outcome. */
@Component({
  selector: 'app-batch-run-detail',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, LoadStatus],
  template: `
    <section class="app-page" aria-labelledby="run-title">
      <a routerLink="/batch-runs" class="back"><mat-icon>arrow_back</mat-icon>All network runs</a>
      <h1 id="run-title" class="app-page-title">Network run</h1>
      @if (!run()) {
        <app-load-status [state]="loadState()" loadingLabel="Loading the network run" (retry)="data.reload()" />
      }
      @if (run(); as run) {
        <p class="meta">
          Started by {{ run.startedBy }} on {{ run.createdAt | date: 'd MMM y, HH:mm:ss' }}
          @if (run.finishedAt) {
            · finished {{ run.finishedAt | date: 'HH:mm:ss' }}
          }
        </p>
        <div class="progress-block">
          <div class="progress-text" role="status" data-testid="batch-progress">
            <strong>{{ runLabels[run.status] }}</strong>: {{ run.done }} of {{ run.total }} scenarios done{{ run.failed > 0 ? ',' : '' }}
            @if (run.failed > 0) {
              <span class="failed">{{ run.failed }} failed</span>
            }
            ({{ percent() }} %)
          </div>
          <mat-progress-bar mode="determinate" [value]="percent()" aria-label="Share of scenarios finished" />
          @if (pollProblem(); as problem) {
            <p class="hint">{{ problem }} Still trying.</p>
          }
        </div>
        <table class="items" aria-label="Scenarios in this run">
          <thead>
            <tr>
              <th scope="col">Scenario</th>
              <th scope="col">Status</th>
              <th scope="col">Problem</th>
            </tr>
          </thead>
          <tbody>
            @for (item of run.items; track item.scenarioId) {
              <tr [attr.data-status]="item.status">
                <th scope="row">{{ item.scenarioName }}</th>
                <td>
                  <span class="status"
                    ><mat-icon aria-hidden="true">{{ icons[item.status] }}</mat-icon
                    >{{ labels[item.status] }}</span
                  >
                </td>
                <td class="error">{{ item.error ?? '' }}</td>
              </tr>
            } @empty {
              <tr>
                <td colspan="3" class="hint">No scenario is marked “in service”.</td>
              </tr>
            }
          </tbody>
        </table>
      }
    </section>
  `,
  styles: `
    .back {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      margin-bottom: 12px;
      font: var(--mat-sys-label-large);
      text-decoration: none;
    }
    .meta {
      color: var(--mat-sys-on-surface-variant);
      margin: 0 0 16px;
    }
    .progress-block {
      display: grid;
      gap: 8px;
      margin: 0 0 20px;
      max-width: 640px;
    }
    .failed,
    .error {
      color: var(--mat-sys-error);
    }
    .hint {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
      margin: 0;
    }
    .items {
      width: 100%;
      border-collapse: collapse;
      font: var(--mat-sys-body-medium);
    }
    .items th,
    .items td {
      text-align: left;
      padding: 8px 12px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      vertical-align: top;
    }
    thead th {
      font: var(--mat-sys-label-large);
      color: var(--mat-sys-on-surface-variant);
    }
    tbody th {
      font-weight: 500;
    }
    .status {
      display: inline-flex;
      align-items: center;
      gap: 6px;
    }
    .status mat-icon {
      font-size: 20px;
      width: 20px;
      height: 20px;
    }
    tr[data-status='done'] .status {
      color: var(--mat-sys-primary);
    }
    tr[data-status='failed'] .status {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class BatchRunDetail {
  private readonly batchRunsApi = inject(BatchRunsApi);

  /** From the `:batchRunId` route parameter. */
  readonly batchRunId = input.required<string>();

  protected readonly labels = BATCH_STATUS_LABELS;
  protected readonly runLabels = RUN_STATUS_LABELS;
  protected readonly icons = BATCH_STATUS_ICONS;
  /**
   * The run as first loaded, asked for by id: a new id drops the earlier answer. Expected
   * failures: unknown id (404), server unreachable, or an answer that fails the shared schema.
   */
  protected readonly data = resource({
    params: () => ({ batchRunId: this.batchRunId() }),
    loader: ({ params }) => this.batchRunsApi.get(params.batchRunId),
  });
  protected readonly loadState = loadStateOf(this.data);
  /** The loaded run, then each answer of the polling while it is not done. */
  protected readonly run = linkedSignal<BatchRun | null>(() => (this.data.hasValue() ? this.data.value() : null));
  protected readonly pollProblem = signal<string | null>(null);
  protected readonly percent = computed(() => {
    const run = this.run();
    return run ? batchProgressPercent(run) : 0;
  });

  constructor() {
    // A run still going is asked for again until it is done; a new id, a reload or leaving the
    // page stops the asking.
    effect((onCleanup) => {
      const loaded = this.data.hasValue() ? this.data.value() : null;
      if (!loaded || loaded.status === 'done') return;
      const poller = this.follow(loaded.id);
      onCleanup(() => poller.stop());
    });
  }

  private follow(batchRunId: string): BatchRunPoller {
    this.pollProblem.set(null);
    return pollBatchRun(
      () => this.batchRunsApi.get(batchRunId),
      (run) => {
        this.run.set(run);
        this.pollProblem.set(null);
      },
      { failed: (error) => this.pollProblem.set(describeApiError(error)) },
    );
  }
}
