import type { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import { passwordWeakness } from '@shared/domain/password-strength';

/** Refuses a new password the server would refuse; the error carries the server's wording. */
export function newPasswordValidator(email: () => string | undefined): ValidatorFn {
  return (control: AbstractControl<string>): ValidationErrors | null => {
    const weakness = passwordWeakness(control.value ?? '', email());
    return weakness ? { weakPassword: weakness } : null;
  };
}

/** Group validator: `confirmation` must repeat `password`. */
export function passwordsMatchValidator(group: AbstractControl): ValidationErrors | null {
  const password = group.get('password')?.value as string | undefined;
  const confirmation = group.get('confirmation')?.value as string | undefined;
  return confirmation && password !== confirmation ? { passwordsDiffer: true } : null;
}
