import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { AccountApi } from '../core/account-api';
import { apiErrorBody, describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { PasswordStrength } from '../ui/password-strength';
import { newPasswordValidator, passwordsMatchValidator } from '../ui/password-validators';

/**
 * Changes the signed-in person's password. Closes with `true` once the server accepted it; the
 * server then ends every session of that person, so the caller sends them to sign in again.
 */
@Component({
  selector: 'app-change-password-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatButtonModule, MatIconModule, PasswordStrength],
  template: `
    <h2 mat-dialog-title>Change password</h2>
    <form class="app-form-dialog" [formGroup]="form" (ngSubmit)="changePassword()" novalidate>
      <mat-dialog-content>
        <p class="note">After the change you will be signed out everywhere and sign in again.</p>
        @if (errorMessage(); as message) {
          <p class="app-inline-error" role="alert"><mat-icon>error</mat-icon>{{ message }}</p>
        }
        <input
          type="email"
          class="app-visually-hidden"
          autocomplete="username"
          [value]="email() ?? ''"
          readonly
          tabindex="-1"
          aria-hidden="true"
        />
        <mat-form-field appearance="outline">
          <mat-label>Current password</mat-label>
          <input matInput type="password" formControlName="currentPassword" autocomplete="current-password" required />
          @if (form.controls.currentPassword.hasError('required')) {
            <mat-error>Enter your current password.</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>New password</mat-label>
          <input
            matInput
            type="password"
            formControlName="password"
            autocomplete="new-password"
            required
            aria-describedby="change-strength"
          />
          @if (form.controls.password.getError('weakPassword'); as weakness) {
            <mat-error>{{ weakness }}</mat-error>
          }
        </mat-form-field>
        <app-password-strength id="change-strength" [password]="password()" [email]="email()" />
        <mat-form-field appearance="outline">
          <mat-label>Repeat the new password</mat-label>
          <input matInput type="password" formControlName="confirmation" autocomplete="new-password" required />
        </mat-form-field>
        @if (form.hasError('passwordsDiffer') && form.controls.confirmation.touched) {
          <p class="app-inline-error" role="alert"><mat-icon>error</mat-icon>The two passwords are not the same.</p>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="isSubmitting()">Change password</button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ChangePasswordDialog {
  private readonly accountApi = inject(AccountApi);
  private readonly dialogRef = inject<MatDialogRef<ChangePasswordDialog, boolean>>(MatDialogRef);
  private readonly session = inject(Session);

  protected readonly email = () => this.session.user()?.email;
  protected readonly form = new FormGroup(
    {
      currentPassword: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
      password: new FormControl('', {
        nonNullable: true,
        validators: [Validators.required, newPasswordValidator(() => this.email())],
      }),
      confirmation: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    },
    { validators: passwordsMatchValidator },
  );
  protected readonly password = toSignal(this.form.controls.password.valueChanges, {
    initialValue: '',
  });
  protected readonly isSubmitting = signal(false);
  protected readonly errorMessage = signal<string | null>(null);

  protected async changePassword(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.isSubmitting.set(true);
    this.errorMessage.set(null);
    const { currentPassword, password } = this.form.getRawValue();
    try {
      await this.accountApi.changePassword({ currentPassword, newPassword: password });
      this.dialogRef.close(true);
    } catch (error: unknown) {
      // Expected: wrong current password (400/401/403) or a password the server refuses (400).
      this.errorMessage.set(changePasswordErrorMessage(error));
    } finally {
      this.isSubmitting.set(false);
    }
  }
}

function changePasswordErrorMessage(error: unknown): string {
  const code = apiErrorBody(error)?.code;
  if (code === 'invalid_credentials' || (error instanceof HttpErrorResponse && error.status === 401)) {
    return 'The current password is not right.';
  }
  return describeApiError(error);
}
