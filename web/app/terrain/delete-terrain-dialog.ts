import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';

export interface DeleteTerrainDialogData {
  name: string;
}

/** Asks before a terrain model and its files are deleted; closes with true to go ahead. */
@Component({
  selector: 'app-delete-terrain-dialog',
  imports: [MatDialogModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>Delete “{{ data.name }}”?</h2>
    <mat-dialog-content>
      <p>
        The elevation model, its map tiles and its file are removed. Routes sampled on it keep their
        stored elevations; new samples use the remaining models. This cannot be undone.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Keep it</button>
      <button matButton="filled" type="button" class="danger" [mat-dialog-close]="true">Delete terrain</button>
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
export class DeleteTerrainDialog {
  protected readonly data = inject<DeleteTerrainDialogData>(MAT_DIALOG_DATA);
}
