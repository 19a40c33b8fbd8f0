import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { describeApiError } from '../core/api-error-message';
import { AccountApi } from '../core/account-api';
import { BrandMark } from '../ui/brand-mark';

/** Asks for a password reset link. The answer never says whether the address is known. */
@Component({
  selector: 'app-forgot-password',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule, MatIconModule, BrandMark],
  template: `
    <main class="auth-page">
      <section class="auth-card" aria-labelledby="forgot-title">
        <header class="auth-brand">
          <app-brand-mark [sizePx]="40" />
          <span class="auth-product">Descentry</span>
        </header>
        <h1 id="forgot-title" class="auth-title">Forgot your password?</h1>
        @if (sentTo(); as address) {
          <p class="app-notice" role="status">
            <mat-icon>mark_email_read</mat-icon>
            <span>
              If {{ address }} belongs to a Descentry account, a link to set a new password is on its way. The link works once and expires;
              check your inbox and spam folder.
            </span>
          </p>
          <a matButton="filled" routerLink="/sign-in">Back to sign in</a>
        } @else {
          <p class="auth-lead">Enter the e-mail address you sign in with. We will send a link to set a new password.</p>
          @if (errorMessage(); as message) {
            <p class="app-inline-error" role="alert"><mat-icon>error</mat-icon>{{ message }}</p>
          }
          <form (ngSubmit)="requestReset()" novalidate>
            <mat-form-field appearance="outline">
              <mat-label>E-mail address</mat-label>
              <input matInput type="email" [formControl]="email" autocomplete="username" required />
              @if (email.hasError('required')) {
                <mat-error>Enter your e-mail address.</mat-error>
              } @else if (email.hasError('email')) {
                <mat-error>Enter an e-mail address like name&#64;authority.example.</mat-error>
              }
            </mat-form-field>
            <div class="auth-actions">
              <a routerLink="/sign-in">Back to sign in</a>
              <button matButton="filled" type="submit" [disabled]="isSubmitting()">Send reset link</button>
            </div>
          </form>
        }
      </section>
    </main>
  `,
  styleUrl: './sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ForgotPassword {
  private readonly accountApi = inject(AccountApi);

  protected readonly email = new FormControl('', {
    nonNullable: true,
    validators: [Validators.required, Validators.email],
  });
  protected readonly isSubmitting = signal(false);
  protected readonly sentTo = signal<string | null>(null);
  protected readonly errorMessage = signal<string | null>(null);

  protected async requestReset(): Promise<void> {
    if (this.email.invalid) {
      this.email.markAsTouched();
      return;
    }
    this.isSubmitting.set(true);
    this.errorMessage.set(null);
    try {
      await this.accountApi.requestPasswordReset(this.email.value.trim());
      this.sentTo.set(this.email.value.trim());
    } catch (error: unknown) {
      // Expected: rate limiting (429) or an unreachable server.
      this.errorMessage.set(describeApiError(error));
    } finally {
      this.isSubmitting.set(false);
    }
  }
}
