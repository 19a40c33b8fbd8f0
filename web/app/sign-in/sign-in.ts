import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { apiErrorBody, describeApiError, describeWait, retryAfterSeconds } from '../core/api-error-message';
import { Session } from '../core/session';
import { BrandMark } from '../ui/brand-mark';
import { safeReturnUrl } from './safe-return-url';

/** Messages for `?notice=` when another page sends the person here. */
const NOTICES: Readonly<Record<string, string>> = {
  'signed-out': 'You have signed out.',
  'password-changed': 'Your password has been changed. Sign in again with the new password.',
  'password-set': 'Your password has been set. Sign in with it now.',
  'invitation-accepted': 'Welcome to Descentry. Your account is ready: sign in with your new password.',
};

/** The public sign-in page: e-mail and password. */
@Component({
  selector: 'app-sign-in',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    BrandMark,
  ],
  templateUrl: './sign-in.html',
  styleUrl: './sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SignIn {
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  /** Where to go after signing in; bound from `?returnUrl=`. */
  readonly returnUrl = input<string>();
  /** Why the person was sent here; bound from `?notice=`. */
  readonly notice = input<string>();

  protected readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.email] }),
    password: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
  });
  protected readonly isSubmitting = signal(false);
  protected readonly errorMessage = signal<string | null>(null);
  protected readonly noticeMessage = computed(() => NOTICES[this.notice() ?? ''] ?? null);

  constructor() {
    void this.skipIfAlreadySignedIn();
  }

  protected async signIn(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.isSubmitting.set(true);
    this.errorMessage.set(null);
    try {
      await this.session.signIn(this.form.getRawValue());
      await this.router.navigateByUrl(safeReturnUrl(this.returnUrl()));
    } catch (error: unknown) {
      // Expected: 401 (wrong e-mail or password), 429 (too many attempts), server unreachable.
      this.errorMessage.set(signInErrorMessage(error));
    } finally {
      this.isSubmitting.set(false);
    }
  }

  private async skipIfAlreadySignedIn(): Promise<void> {
    await this.session.ensureLoaded();
    if (this.session.role()) await this.router.navigateByUrl(safeReturnUrl(this.returnUrl()));
  }
}

/** What to tell the person when signing in fails. */
export function signInErrorMessage(error: unknown): string {
  if (error instanceof HttpErrorResponse) {
    if (error.status === 401) {
      return 'The e-mail address or the password is not right. Check both and try again.';
    }
    if (error.status === 429) {
      const seconds = retryAfterSeconds(error);
      return seconds === null
        ? 'Too many sign-in attempts. Wait a few minutes before trying again.'
        : `Too many sign-in attempts. Wait ${describeWait(seconds)} before trying again.`;
    }
    if (error.status === 403) {
      return apiErrorBody(error)?.message ?? 'This account is disabled. Ask your administrator.';
    }
  }
  return describeApiError(error);
}
