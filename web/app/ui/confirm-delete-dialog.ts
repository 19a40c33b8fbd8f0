import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule } from '@angular/material/dialog';
import { firstValueFrom } from 'rxjs';
import { DELETED_RETENTION_DAYS } from '@shared/domain/deleted-items';

export interface ConfirmDeleteData {
  /** What is deleted, as the title names it: "route", "scenario", "vehicle profile", "terrain model". */
  what: string;
  name: string;
  /** What deleting it does, in a sentence or two. */
  consequence: string;
}

/**
 * Asks before a route, scenario, vehicle profile or terrain model is deleted, and says how to get
 * it back: deletes are restorable under Recently deleted for DELETED_RETENTION_DAYS days.
 * Closes with true to go ahead.
 */
@Component({
  selector: 'app-confirm-delete-dialog',
  imports: [MatDialogModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>Delete the {{ data.what }} “{{ data.name }}”?</h2>
    <mat-dialog-content>
      <p>{{ data.consequence }}</p>
      <p>
        You or a colleague can restore it under <strong>Recently deleted</strong> for {{ retentionDays }} days; after that it is removed for
        good.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Keep it</button>
      <button matButton="filled" type="button" class="danger" [mat-dialog-close]="true">Delete {{ data.what }}</button>
    </mat-dialog-actions>
  `,
  styles: `
    .danger {
      --mat-button-filled-container-color: var(--mat-sys-error);
      --mat-button-filled-label-text-color: var(--mat-sys-on-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfirmDeleteDialog {
  protected readonly data = inject<ConfirmDeleteData>(MAT_DIALOG_DATA);
  protected readonly retentionDays = DELETED_RETENTION_DAYS;
}

/** Opens the dialog; resolves true when the person confirms. */
export async function confirmDelete(dialog: MatDialog, data: ConfirmDeleteData): Promise<boolean> {
  const ref = dialog.open<ConfirmDeleteDialog, ConfirmDeleteData, boolean>(ConfirmDeleteDialog, { data, width: '480px', maxWidth: '95vw' });
  return (await firstValueFrom(ref.afterClosed())) === true;
}
