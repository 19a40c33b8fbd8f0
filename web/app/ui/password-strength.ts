import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MIN_PASSWORD_LENGTH, passwordWeakness } from '@shared/domain/password-strength';

/** Strength levels shown to the person; only "refused" blocks saving (the server's rule). */
export type PasswordStrengthLevel = 'empty' | 'refused' | 'acceptable' | 'strong';

/** A password this long and accepted by the shared rule counts as strong. */
const STRONG_PASSWORD_LENGTH = 16;

/** Judges a new password with the same rule the server applies (shared/domain). */
export function passwordStrength(password: string, email?: string): { level: PasswordStrengthLevel; message: string } {
  if (!password) {
    return { level: 'empty', message: `Use at least ${MIN_PASSWORD_LENGTH} characters. A few unrelated words work well.` };
  }
  const weakness = passwordWeakness(password, email);
  if (weakness) return { level: 'refused', message: weakness };
  if (password.length >= STRONG_PASSWORD_LENGTH) return { level: 'strong', message: 'Strong password.' };
  return { level: 'acceptable', message: 'Acceptable. A longer password is stronger.' };
}

/** Live feedback under a new-password field: a three-step meter and a sentence. */
@Component({
  selector: 'app-password-strength',
  imports: [MatIconModule],
  template: `
    @let judged = strength();
    <div class="meter" [attr.data-level]="judged.level" aria-hidden="true"><span></span><span></span><span></span></div>
    <p class="message" role="status" aria-live="polite" data-testid="password-strength">
      @switch (judged.level) {
        @case ('refused') {
          <mat-icon inline>error</mat-icon>
        }
        @case ('acceptable') {
          <mat-icon inline>check</mat-icon>
        }
        @case ('strong') {
          <mat-icon inline>verified</mat-icon>
        }
      }
      {{ judged.message }}
    </p>
  `,
  styles: `
    :host {
      display: block;
      margin: -4px 0 12px;
    }
    .meter {
      display: grid;
      grid-template-columns: repeat(3, 1fr);
      gap: 4px;
      height: 6px;
    }
    .meter span {
      border-radius: 3px;
      background: var(--mat-sys-surface-container-highest);
    }
    .meter[data-level='refused'] span:nth-child(1) {
      background: var(--mat-sys-error);
    }
    .meter[data-level='acceptable'] span:nth-child(-n + 2) {
      background: var(--mat-sys-tertiary);
    }
    .meter[data-level='strong'] span {
      background: var(--mat-sys-primary);
    }
    .message {
      display: flex;
      gap: 6px;
      align-items: center;
      margin: 6px 0 0;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PasswordStrength {
  /** The password being typed. */
  readonly password = input.required<string>();
  /** The account's e-mail address: its name part is refused inside the password. */
  readonly email = input<string>();

  protected readonly strength = computed(() => passwordStrength(this.password(), this.email()));
}
