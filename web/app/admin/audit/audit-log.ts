import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, resource } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import {
  AUDIT_ACTIONS,
  AUDIT_ACTION_LABELS,
  AUDITED_KINDS,
  AUDITED_KIND_LABELS,
  type AuditAction,
  type AuditEvent,
  type AuditLogPage,
  type AuditedKind,
} from '@shared/domain/audit';
import { appLinkOf } from '../../deleted-items/restorers';
import { AuditApi } from './audit-api';
import { filterOf } from '../../ui/list-table';
import { loadStateOf } from '../../ui/load-state';
import { LoadStatus } from '../../ui/load-status';

const PAGE_SIZE = 50;

const NO_AUDIT_FILTER: { kind: AuditedKind | ''; action: AuditAction | ''; actor: string } = { kind: '', action: '', actor: '' };

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
  /** The filter, once typing pauses for a quarter of a second. */
  private readonly filter = filterOf(this.filterForm, NO_AUDIT_FILTER, { debounceMs: 250 });
  /** The page shown; a changed filter starts again from the first. */
  protected readonly pageIndex = linkedSignal(() => {
    this.filter();
    return 0;
  });
  /** One page of the log as the server filters it: a new filter or page drops the earlier answer. */
  protected readonly data = resource({
    params: () => ({ filter: this.filter(), page: this.pageIndex() + 1 }),
    loader: ({ params }) =>
      this.api.page({
        kind: params.filter.kind || undefined,
        action: params.filter.action || undefined,
        actor: params.filter.actor.trim() || undefined,
        page: params.page,
        pageSize: PAGE_SIZE,
      }),
  });
  protected readonly loadState = loadStateOf(this.data);
  /** The page last answered, kept on screen while the next one loads. */
  private readonly shownPage = linkedSignal<AuditLogPage | undefined, AuditLogPage | undefined>({
    source: () => (this.data.hasValue() ? this.data.value() : undefined),
    computation: (page, previous) => page ?? previous?.value,
  });
  protected readonly events = computed(() => this.shownPage()?.items ?? []);
  protected readonly total = computed(() => this.shownPage()?.total ?? 0);

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
  }

  protected clearFilter(): void {
    this.filterForm.reset();
  }
}
