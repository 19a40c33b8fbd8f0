import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { Person } from '@shared/domain/people';
import { ROLES, ROLE_LABELS, type Role } from '@shared/domain/roles';
import { describeApiError } from '../../core/api-error-message';
import { PeopleApi } from './people-api';

/** Invites one person by e-mail; closes with the new Person once the API created it. */
@Component({
  selector: 'app-invite-person-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatButtonModule, MatIconModule],
  template: `
    <h2 mat-dialog-title>Invite a person</h2>
    <form class="app-form-dialog" [formGroup]="form" (ngSubmit)="invite()" novalidate>
      <mat-dialog-content>
        <p class="note">They receive an e-mail with a link to choose their password.</p>
        @if (errorMessage(); as message) {
          <p class="app-inline-error" role="alert"><mat-icon>error</mat-icon>{{ message }}</p>
        }
        <mat-form-field appearance="outline">
          <mat-label>E-mail address</mat-label>
          <input matInput type="email" formControlName="email" autocomplete="off" required />
          @if (form.controls.email.hasError('required')) {
            <mat-error>Enter their e-mail address.</mat-error>
          } @else if (form.controls.email.hasError('email')) {
            <mat-error>Enter an e-mail address like name&#64;authority.example.</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Name</mat-label>
          <input matInput formControlName="name" autocomplete="off" maxlength="120" required />
          @if (form.controls.name.hasError('required')) {
            <mat-error>Enter their name as colleagues know it.</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Role</mat-label>
          <mat-select formControlName="role" required>
            @for (role of roles; track role) {
              <mat-option [value]="role">{{ roleLabels[role] }}</mat-option>
            }
          </mat-select>
          @if (form.controls.role.hasError('required')) {
            <mat-error>Choose a role.</mat-error>
          }
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="isSubmitting()">Send invitation</button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvitePersonDialog {
  private readonly peopleApi = inject(PeopleApi);
  private readonly dialogRef = inject<MatDialogRef<InvitePersonDialog, Person>>(MatDialogRef);

  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.email] }),
    name: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    role: new FormControl<Role | null>(null, { validators: [Validators.required] }),
  });
  protected readonly isSubmitting = signal(false);
  protected readonly errorMessage = signal<string | null>(null);

  protected async invite(): Promise<void> {
    const { email, name, role } = this.form.getRawValue();
    if (this.form.invalid || !role) {
      this.form.markAllAsTouched();
      return;
    }
    this.isSubmitting.set(true);
    this.errorMessage.set(null);
    try {
      const person = await this.peopleApi.invite({ email: email.trim(), name: name.trim(), role });
      this.dialogRef.close(person);
    } catch (error: unknown) {
      // Expected: 409 when the address already has an account, 400 on a refused field.
      this.errorMessage.set(describeApiError(error));
    } finally {
      this.isSubmitting.set(false);
    }
  }
}
