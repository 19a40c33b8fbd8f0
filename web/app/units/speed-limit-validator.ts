import type { ValidatorFn } from '@angular/forms';
import { speedLimitRange, type UnitSystem } from '@shared/presentation/index';

/**
 * Validates a speed limit typed in the displayed unit against the contract's range
 * (shared/domain/limits.ts) in the units chosen now: `{ speedLimit: { min, max } }` when outside.
 */
export function speedLimitValidator(system: () => UnitSystem): ValidatorFn {
  return (control) => {
    const value = control.value as number | null;
    if (value === null || value === undefined || (value as unknown) === '') return null;
    const { min, max } = speedLimitRange(system());
    return value >= min && value <= max ? null : { speedLimit: { min, max } };
  };
}
