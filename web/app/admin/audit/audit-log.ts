import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { debounceTime } from 'rxjs';
import {
  AUDIT_ACTIONS,
  AUDIT_ACTION_LABELS,
  AUDITED_KINDS,
  AUDITED_KIND_LABELS,
  type AuditAction,
  type AuditEvent,
  type AuditedKind,
} from '@shared/domain/audit';
import { describeApiError } from '../../core/api-error-message';
import { appLinkOf } from '../../deleted-items/restorers';
import { AuditApi } from './audit-api';
import type { LoadState } from '../../ui/load-state';
import { LoadStatus } from '../../ui/load-status';

const PAGE_SIZE = 50;

/** Administrators' view of every create, change, delete, restore and purge of shared work. */
@Component({
  selector: 'app-audit-log',
  imports: [
    LoadStatus,
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatTableModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
  ],
  templateUrl: './audit-log.html',
  styleUrl: './audit-log.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class AuditLog {
  private readonly api = inject(AuditApi);

  protected readonly kinds = AUDITED_KINDS;
  protected readonly actions = AUDIT_ACTIONS;
  protected readonly kindLabels = AUDITED_KIND_LABELS;
  protected readonly actionLabels = AUDIT_ACTION_LABELS;
  protected readonly columns = ['at', 'actor', 'action', 'kind', 'name', 'details'];
  protected readonly pageSize = PAGE_SIZE;

  protected readonly filterForm = new FormGroup({
    kind: new FormControl<AuditedKind | ''>('', { nonNullable: true }),
    action: new FormControl<AuditAction | ''>('', { nonNullable: true }),
    actor: new FormControl('', { nonNullable: true }),
  });
  protected readonly events = signal<AuditEvent[]>([]);
  protected readonly total = signal(0);
  protected readonly pageIndex = signal(0);
  protected readonly loadState = signal<LoadState>({ status: 'loading' });

  constructor() {
    this.filterForm.valueChanges.pipe(debounceTime(250)).subscribe(() => {
      this.pageIndex.set(0);
      void this.load();
    });
    void this.load();
  }

  protected kindLabel(event: AuditEvent): string {
    return AUDITED_KIND_LABELS[event.kind];
  }

  protected actionLabel(event: AuditEvent): string {
    return AUDIT_ACTION_LABELS[event.action];
  }

  /** Where the changed thing is shown (it may be gone: then the page says so). */
  protected linkOf(event: AuditEvent): string[] | null {
    return event.action === 'purge' ? null : appLinkOf(event.kind, event.entityId);
  }

  /** The event's details as "key: value" pairs in words. */
  protected detailsOf(event: AuditEvent): string {
    return Object.entries(event.details)
      .map(
        ([key, value]) =>
          `${key.replace(/([A-Z])/g, ' $1').toLowerCase()}: ${value === true ? 'yes' : value === false ? 'no' : (value ?? '—')}`,
      )
      .join(' · ');
  }

  protected changePage(page: PageEvent): void {
    this.pageIndex.set(page.pageIndex);
    void this.load();
  }

  protected clearFilter(): void {
    this.filterForm.reset();
  }

  protected async load(): Promise<void> {
    this.loadState.set({ status: 'loading' });
    const filter = this.filterForm.getRawValue();
    try {
      const page = await this.api.page({
        kind: filter.kind || undefined,
        action: filter.action || undefined,
        actor: filter.actor.trim() || undefined,
        page: this.pageIndex() + 1,
        pageSize: PAGE_SIZE,
      });
      this.events.set(page.items);
      this.total.set(page.total);
      this.loadState.set({ status: 'ready' });
    } catch (error: unknown) {
      // Expected: server unreachable or an answer that fails the shared schema.
      this.loadState.set({ status: 'error', message: describeApiError(error) });
    }
  }
}
