import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';
import { AUDITED_KIND_LABELS, RESTORABLE_KINDS, type RestorableKind } from '@shared/domain/audit';
import { DELETED_RETENTION_DAYS, type DeletedItem } from '@shared/domain/deleted-items';
import { ROLE_LABELS } from '@shared/domain/roles';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { DeletedItemsApi } from './deleted-items-api';
import { RESTORE_PERMISSION, can, rolesWith } from '@shared/domain/permissions';
import { appLinkOf } from './restorers';
import type { LoadState } from '../ui/load-state';
import { LoadStatus } from '../ui/load-status';

/**
 * Routes, scenarios, vehicle profiles and terrain models deleted in the last 30 days, with who
 * deleted them and when they go for good; the roles that may change a kind restore it here.
 */
@Component({
  selector: 'app-recently-deleted',
  imports: [LoadStatus, DatePipe, ReactiveFormsModule, MatTableModule, MatButtonModule, MatIconModule, MatFormFieldModule, MatSelectModule],
  templateUrl: './recently-deleted.html',
  styleUrl: './recently-deleted.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class RecentlyDeleted {
  private readonly api = inject(DeletedItemsApi);
  private readonly session = inject(Session);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);

  protected readonly kinds = RESTORABLE_KINDS;
  protected readonly kindLabels = AUDITED_KIND_LABELS;
  protected readonly retentionDays = DELETED_RETENTION_DAYS;
  protected readonly columns = ['kind', 'name', 'deletedAt', 'deletedBy', 'removedAfter', 'action'];
  protected readonly kindFilter = new FormControl<RestorableKind | ''>('', { nonNullable: true });
  private readonly kind = toSignal(this.kindFilter.valueChanges, { initialValue: '' as RestorableKind | '' });

  protected readonly items = signal<DeletedItem[]>([]);
  protected readonly loadState = signal<LoadState>({ status: 'loading' });
  protected readonly restoring = signal<string | null>(null);
  protected readonly visibleItems = computed(() => {
    const kind = this.kind();
    return kind ? this.items().filter((item) => item.kind === kind) : this.items();
  });

  constructor() {
    void this.load();
  }

  /** Whether the signed-in person may restore this kind. */
  protected mayRestore(item: DeletedItem): boolean {
    return can(this.session.role(), RESTORE_PERMISSION[item.kind]);
  }

  protected kindLabel(item: DeletedItem): string {
    return AUDITED_KIND_LABELS[item.kind];
  }

  /** The roles that may restore the item, in words. */
  protected whoRestores(item: DeletedItem): string {
    return rolesWith(RESTORE_PERMISSION[item.kind])
      .map((role) => `${ROLE_LABELS[role].toLowerCase()}s`)
      .join(' and ');
  }

  protected async restore(item: DeletedItem): Promise<void> {
    this.restoring.set(item.id);
    try {
      await this.api.restore(item.kind, item.id);
      this.items.update((items) => items.filter((other) => other.id !== item.id));
      const answer = this.snackBar.open(`${AUDITED_KIND_LABELS[item.kind]} “${item.name}” is back.`, 'Open');
      answer.onAction().subscribe(() => void this.router.navigate(appLinkOf(item.kind, item.id)));
    } catch (error: unknown) {
      // Expected: its route or profile is deleted too (409), or it is already back; the
      // interceptor has said why. Reload to show the current state.
      console.warn('Not restored', describeApiError(error));
      await this.load();
    } finally {
      this.restoring.set(null);
    }
  }

  protected async load(): Promise<void> {
    this.loadState.set({ status: 'loading' });
    try {
      this.items.set((await this.api.list()).items);
      this.loadState.set({ status: 'ready' });
    } catch (error: unknown) {
      // Expected: server unreachable or an answer that fails the shared schema.
      this.loadState.set({ status: 'error', message: describeApiError(error) });
    }
  }
}
