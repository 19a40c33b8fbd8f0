import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { REVIEW_STATE_LABELS, type ReviewState } from '@shared/domain/reviews';

/** Descentry's own look for each review state: open states stand out, closed ones recede. */
const STATE_LOOK: Readonly<Record<ReviewState, { icon: string; tone: string }>> = {
  raised: { icon: 'flag', tone: 'open' },
  'in-review': { icon: 'visibility', tone: 'working' },
  mitigated: { icon: 'shield', tone: 'closed' },
  'awaiting-sign-off': { icon: 'pending_actions', tone: 'working' },
  accepted: { icon: 'task_alt', tone: 'settled' },
  reopened: { icon: 'replay', tone: 'open' },
};

/** A review state as a small label with an icon; the words come from the shared contract. */
@Component({
  selector: 'app-review-state-chip',
  template: `<span class="state" [class]="'state tone-' + look().tone"
    ><span class="material-symbols-outlined" aria-hidden="true">{{ look().icon }}</span
    >{{ label() }}</span
  >`,
  styles: `
    :host {
      display: inline-block;
    }
    .state {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      padding: 1px 10px 1px 6px;
      border-radius: 6px;
      border: 1px solid transparent;
      font: var(--mat-sys-label-large);
      white-space: nowrap;
      -webkit-print-color-adjust: exact;
      print-color-adjust: exact;
    }
    .material-symbols-outlined {
      font-size: 16px;
    }
    .tone-open {
      background: var(--mat-sys-surface);
      color: var(--mat-sys-on-surface);
      border-color: var(--mat-sys-outline);
    }
    .tone-working {
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
    .tone-closed {
      background: var(--mat-sys-primary-container);
      color: var(--mat-sys-on-primary-container);
    }
    .tone-settled {
      background: var(--mat-sys-surface-container-highest);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewStateChip {
  readonly state = input.required<ReviewState>();

  protected readonly label = computed(() => REVIEW_STATE_LABELS[this.state()]);
  protected readonly look = computed(() => STATE_LOOK[this.state()]);
}
