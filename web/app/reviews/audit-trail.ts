import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { AuditEvent } from '@shared/domain/reviews';
import { describeAuditDetails } from './audit-details';
import { ReviewStateChip } from './review-state-chip';

/** Every change to a review item, oldest first: who, when, from which state to which, and why. */
@Component({
  selector: 'app-audit-trail',
  imports: [DatePipe, ReviewStateChip],
  template: `
    @if (entries().length === 0) {
      <p class="empty">No changes recorded yet.</p>
    } @else {
      <ol class="trail" aria-label="Audit trail">
        @for (entry of entries(); track entry.event.id) {
          <li class="event" data-testid="audit-event">
            <div class="head">
              <span class="who">{{ entry.event.actorName }}</span>
              <time [attr.datetime]="entry.event.at">{{ entry.event.at | date: 'd MMM y, HH:mm' }}</time>
            </div>
            <div class="move">
              @if (entry.event.fromState) {
                <app-review-state-chip [state]="entry.event.fromState" />
                <span class="arrow" aria-label="to">→</span>
              }
              <app-review-state-chip [state]="entry.event.toState" />
            </div>
            @if (entry.event.note) {
              <p class="note">{{ entry.event.note }}</p>
            }
            @if (entry.details.length > 0) {
              <dl class="details">
                @for (line of entry.details; track $index) {
                  <div>
                    <dt>{{ line.label }}</dt>
                    <dd>{{ line.value }}</dd>
                  </div>
                }
              </dl>
            }
          </li>
        }
      </ol>
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .empty {
      color: var(--mat-sys-on-surface-variant);
      margin: 0;
    }
    .trail {
      list-style: none;
      margin: 0;
      padding: 0;
      border-left: 2px solid var(--mat-sys-outline-variant);
    }
    .event {
      position: relative;
      padding: 0 0 16px 18px;
    }
    .event::before {
      content: '';
      position: absolute;
      left: -7px;
      top: 4px;
      width: 12px;
      height: 12px;
      border-radius: 50%;
      background: var(--mat-sys-primary);
      border: 2px solid var(--mat-sys-surface);
    }
    .head {
      display: flex;
      flex-wrap: wrap;
      gap: 4px 12px;
      align-items: baseline;
    }
    .who {
      font: var(--mat-sys-title-small);
    }
    time {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .move {
      display: flex;
      align-items: center;
      gap: 6px;
      margin: 6px 0;
      flex-wrap: wrap;
    }
    .arrow {
      color: var(--mat-sys-on-surface-variant);
    }
    .note {
      margin: 4px 0;
      font: var(--mat-sys-body-medium);
      white-space: pre-line;
    }
    .details {
      margin: 4px 0 0;
      display: grid;
      gap: 2px;
      font: var(--mat-sys-body-small);
    }
    .details div {
      display: flex;
      gap: 6px;
      flex-wrap: wrap;
    }
    dt {
      color: var(--mat-sys-on-surface-variant);
    }
    dt::after {
      content: ':';
    }
    dd {
      margin: 0;
      font-weight: 500;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuditTrail {
  readonly events = input.required<readonly AuditEvent[]>();

  protected readonly entries = computed(() =>
    [...this.events()]
      .sort((a, b) => Date.parse(a.at) - Date.parse(b.at))
      .map((event) => ({ event, details: describeAuditDetails(event.details) })),
  );
}
