import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  resource,
  signal,
  untracked,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import type { TokenInfoResponse } from '@shared/domain/auth';
import { AccountApi, type AccountTokenKind } from '../core/account-api';
import { describeApiError } from '../core/api-error-message';
import { BrandMark } from '../ui/brand-mark';
import { PasswordStrength } from '../ui/password-strength';
import { newPasswordValidator, passwordsMatchValidator } from '../ui/password-validators';

type TokenState =
  { status: 'checking' } | { status: 'invalid'; title: string; message: string } | { status: 'ready'; info: TokenInfoResponse };

const PAGE_TEXT: Readonly<Record<AccountTokenKind, { title: string; action: string }>> = {
  invite: { title: 'Accept your invitation', action: 'Create account' },
  reset: { title: 'Set a new password', action: 'Save new password' },
};

/**
 * Landing page for the e-mailed links: /accept-invite?token=… and /reset-password?token=….
 * Checks the token first so an expired or used link is explained before anyone types a password.
 */
@Component({
  selector: 'app-set-password',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    BrandMark,
    PasswordStrength,
  ],
  templateUrl: './set-password.html',
  styleUrl: '../sign-in/sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SetPassword {
  private readonly accountApi = inject(AccountApi);
  private readonly router = inject(Router);

  /** Which link this page serves; bound from the route's data. */
  readonly kind = input<AccountTokenKind>('reset');
  /** The single-use token from the e-mail; bound from `?token=`. */
  readonly token = input<string>();

  /** The token checked with the server, asked for by token: a new token drops the earlier answer. */
  private readonly tokenCheck = resource({
    params: () => {
      const token = this.token();
      return token ? { token } : undefined;
    },
    loader: ({ params }) => this.accountApi.tokenInfo(params.token),
  });
  /** What the check says, until a save finds the link no longer usable. */
  protected readonly tokenState = linkedSignal<TokenState>(() => {
    if (!this.token()) return INCOMPLETE_LINK;
    const check = this.tokenCheck;
    // Expected failures: 404 (unknown token), 410 (expired or used), 400 (malformed token).
    if (check.status() === 'error') return invalidState(this.kind(), check.error());
    return check.hasValue() && !check.isLoading() ? { status: 'ready', info: check.value() } : { status: 'checking' };
  });
  protected readonly accountEmail = computed(() => {
    const state = this.tokenState();
    return state.status === 'ready' ? state.info.email : undefined;
  });
  protected readonly form = new FormGroup(
    {
      password: new FormControl('', {
        nonNullable: true,
        validators: [Validators.required, newPasswordValidator(() => this.accountEmail())],
      }),
      confirmation: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    },
    { validators: passwordsMatchValidator },
  );
  protected readonly password = toSignal(this.form.controls.password.valueChanges, {
    initialValue: '',
  });
  protected readonly text = computed(() => PAGE_TEXT[this.kind()]);
  protected readonly isSubmitting = signal(false);
  protected readonly errorMessage = signal<string | null>(null);

  constructor() {
    // The password rule refuses the account's e-mail name: check again what was typed once the
    // e-mail is known. Only the form is touched here, not the signals it reads.
    effect(() => {
      if (this.accountEmail() !== undefined) untracked(() => this.form.controls.password.updateValueAndValidity());
    });
  }

  protected async savePassword(): Promise<void> {
    const token = this.token();
    if (this.form.invalid || !token) {
      this.form.markAllAsTouched();
      return;
    }
    this.isSubmitting.set(true);
    this.errorMessage.set(null);
    const { password } = this.form.getRawValue();
    try {
      if (this.kind() === 'invite') {
        await this.accountApi.acceptInvitation(token, password);
      } else {
        await this.accountApi.confirmPasswordReset(token, password);
      }
      const notice = this.kind() === 'invite' ? 'invitation-accepted' : 'password-set';
      await this.router.navigate(['/sign-in'], { queryParams: { notice } });
    } catch (error: unknown) {
      // Expected: the link expired while the page was open (404/410) or the server refused the
      // password (400); both are explained here.
      if (isUnusableToken(error)) this.tokenState.set(invalidState(this.kind(), error));
      else this.errorMessage.set(describeApiError(error));
    } finally {
      this.isSubmitting.set(false);
    }
  }
}

const INCOMPLETE_LINK: TokenState = {
  status: 'invalid',
  title: 'This link is incomplete',
  message:
    'The address has no token. Open the link from the e-mail again; if your mail program split it over two lines, copy the whole address.',
};

function isUnusableToken(error: unknown): boolean {
  return error instanceof HttpErrorResponse && [400, 404, 410].includes(error.status);
}

function invalidState(kind: AccountTokenKind, error: unknown): TokenState {
  const askAgain =
    kind === 'invite'
      ? 'Ask your Descentry administrator to send a new invitation.'
      : 'Ask for a new link from the "Forgot password?" page.';
  if (error instanceof HttpErrorResponse && error.status === 410) {
    return {
      status: 'invalid',
      title: 'This link has expired or was already used',
      message: `Links from Descentry e-mails work once and only for a limited time. ${askAgain}`,
    };
  }
  if (isUnusableToken(error)) {
    return {
      status: 'invalid',
      title: 'This link is not valid',
      message: `Descentry does not recognise this link. It may be mistyped or replaced by a newer one. ${askAgain}`,
    };
  }
  return { status: 'invalid', title: 'The link could not be checked', message: describeApiError(error) };
}
