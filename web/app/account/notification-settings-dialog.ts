import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import type { NotificationSettings } from '@shared/domain/reviews';
import type { Role } from '@shared/domain/roles';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { NotificationsApi } from './notifications-api';

interface Switch {
  key: keyof NotificationSettings;
  label: string;
  explanation: string;
  /** Roles for whom this mail is part of the job (shown first, marked "for your role"). */
  forRoles: readonly Role[];
}

/** Every e-mail a person can switch off, with who it is meant for. */
export const NOTIFICATION_SWITCHES: readonly Switch[] = [
  {
    key: 'newHighRiskDescent',
    label: 'New high-risk descent',
    explanation: 'An e-mail when a scenario run finds a new descent at high or critical brake-fade risk, or makes a reviewed one worse.',
    forRoles: ['safety'],
  },
  {
    key: 'reviewResolved',
    label: 'Review decided',
    explanation: 'An e-mail when a safety officer mitigates or accepts a descent on one of your scenarios.',
    forRoles: ['planner'],
  },
];

/** "Notification settings" from the account menu: the person's own e-mail switches. */
@Component({
  selector: 'app-notification-settings-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatIconModule, MatProgressBarModule, MatSlideToggleModule],
  template: `
    <h2 mat-dialog-title>Notification settings</h2>
    <form [formGroup]="form" (ngSubmit)="save()">
      <mat-dialog-content>
        <p class="lead">Choose which e-mails Descentry sends you. Mails meant for your role are marked.</p>
        @if (loading()) {
          <mat-progress-bar mode="indeterminate" aria-label="Loading your settings" />
        }
        @for (item of switches(); track item.key) {
          <div class="switch">
            <mat-slide-toggle [formControlName]="item.key" [attr.data-testid]="'switch-' + item.key">
              {{ item.label }}
              @if (item.mine) {
                <span class="mine">for your role</span>
              }
            </mat-slide-toggle>
            <p class="explanation">{{ item.explanation }}</p>
          </div>
        }
        @if (error(); as message) {
          <p class="app-inline-error" role="alert"><mat-icon>error</mat-icon>{{ message }}</p>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="loading() || saving()">Save</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .lead {
      margin: 0 0 16px;
    }
    .switch {
      margin: 0 0 16px;
    }
    .explanation {
      margin: 4px 0 0 52px;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .mine {
      margin-left: 8px;
      padding: 1px 8px;
      border-radius: 999px;
      font: var(--mat-sys-label-small);
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotificationSettingsDialog {
  private readonly api = inject(NotificationsApi);
  private readonly dialogRef = inject<MatDialogRef<NotificationSettingsDialog, boolean>>(MatDialogRef);
  private readonly session = inject(Session);

  protected readonly loading = signal(true);
  protected readonly saving = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly switches = computed(() => {
    const role = this.session.role();
    const mine = (item: Switch) => (role ? item.forRoles.includes(role) : false);
    return [...NOTIFICATION_SWITCHES].sort((a, b) => Number(mine(b)) - Number(mine(a))).map((item) => ({ ...item, mine: mine(item) }));
  });

  protected readonly form = new FormGroup({
    newHighRiskDescent: new FormControl(true, { nonNullable: true }),
    reviewResolved: new FormControl(true, { nonNullable: true }),
  });

  constructor() {
    void this.load();
  }

  protected async save(): Promise<void> {
    this.saving.set(true);
    this.error.set(null);
    try {
      await this.api.save(this.form.getRawValue());
      this.dialogRef.close(true);
    } catch (error: unknown) {
      // Expected: server unreachable or a refused value; the dialog stays open to try again.
      this.error.set(describeApiError(error));
    } finally {
      this.saving.set(false);
    }
  }

  private async load(): Promise<void> {
    try {
      this.form.setValue(await this.api.get());
    } catch (error: unknown) {
      // Expected: server unreachable; the switches show the defaults and saving may still work.
      this.error.set(describeApiError(error));
    } finally {
      this.loading.set(false);
    }
  }
}
