import {
  FormControl,
  FormGroup,
  Validators,
  type AbstractControl,
  type ValidationErrors,
  type ValidatorFn,
} from '@angular/forms';
import { SPEED_LIMIT_KPH } from '@shared/domain/limits';
import { reviewTransitionRequestSchema, type ReviewTransitionRequest } from '@shared/domain/reviews';

/** Shortest reason a safety officer may give for accepting a risk (the contract's rule). */
export const ACCEPT_REASON_MIN_LENGTH = 10;
/** Shortest note for reopening an item (the contract's rule). */
export const REOPEN_NOTE_MIN_LENGTH = 3;
const NOTE_MAX_LENGTH = 2_000;

/** Like Validators.minLength, but spaces around the text do not count (the server trims too). */
export function trimmedMinLength(minLength: number): ValidatorFn {
  return (control: AbstractControl<string | null>): ValidationErrors | null => {
    const length = (control.value ?? '').trim().length;
    return length >= minLength ? null : { trimmedMinLength: { requiredLength: minLength, actualLength: length } };
  };
}

/** A mitigation must name at least one measure: speed cap, SOC ceiling, restriction or retarder. */
export const atLeastOneMeasure: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const value = (group as MitigationForm).getRawValue();
  const hasMeasure =
    value.descentSpeedCapKph !== null ||
    value.socCeilingPercent !== null ||
    value.vehicleRestriction.trim() !== '' ||
    value.mandatoryRetarder;
  return hasMeasure ? null : { noMeasure: true };
};

export type MitigationForm = ReturnType<typeof mitigationForm>;

/** "Record mitigation": the measures (km/h and % as people type them), a note, and the re-run box. */
export function mitigationForm() {
  return new FormGroup(
    {
      descentSpeedCapKph: new FormControl<number | null>(null, [Validators.min(SPEED_LIMIT_KPH.min), Validators.max(SPEED_LIMIT_KPH.max)]),
      socCeilingPercent: new FormControl<number | null>(null, [Validators.min(5), Validators.max(100)]),
      vehicleRestriction: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(500)] }),
      mandatoryRetarder: new FormControl(false, { nonNullable: true }),
      note: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(NOTE_MAX_LENGTH)] }),
      rerun: new FormControl(true, { nonNullable: true }),
    },
    { validators: [atLeastOneMeasure] },
  );
}

/** "Accept risk": a reason of at least ten characters. */
export function acceptForm() {
  return new FormGroup({
    reason: new FormControl('', {
      nonNullable: true,
      validators: [trimmedMinLength(ACCEPT_REASON_MIN_LENGTH), Validators.maxLength(NOTE_MAX_LENGTH)],
    }),
  });
}

/** "Reopen": why the item needs another look. */
export function reopenForm() {
  return new FormGroup({
    note: new FormControl('', {
      nonNullable: true,
      validators: [trimmedMinLength(REOPEN_NOTE_MIN_LENGTH), Validators.maxLength(NOTE_MAX_LENGTH)],
    }),
  });
}

/** The request body for a valid mitigation form; SOC goes to the API as 0–1. */
export function mitigateRequest(form: MitigationForm): ReviewTransitionRequest {
  const value = form.getRawValue();
  const restriction = value.vehicleRestriction.trim();
  const note = value.note.trim();
  return reviewTransitionRequestSchema.parse({
    action: 'mitigate',
    mitigation: {
      ...(value.descentSpeedCapKph !== null ? { descentSpeedCapKph: value.descentSpeedCapKph } : {}),
      ...(value.socCeilingPercent !== null ? { socCeiling: roundShare(value.socCeilingPercent / 100) } : {}),
      ...(restriction ? { vehicleRestriction: restriction } : {}),
      ...(value.mandatoryRetarder ? { mandatoryRetarder: true } : {}),
    },
    ...(note ? { note } : {}),
    rerun: value.rerun,
  });
}

export function acceptRequest(form: ReturnType<typeof acceptForm>): ReviewTransitionRequest {
  return reviewTransitionRequestSchema.parse({ action: 'accept', reason: form.getRawValue().reason.trim() });
}

export function reopenRequest(form: ReturnType<typeof reopenForm>): ReviewTransitionRequest {
  return reviewTransitionRequestSchema.parse({ action: 'reopen', note: form.getRawValue().note.trim() });
}

/** 0.8 stays 0.8, not 0.8000000000000002. */
function roundShare(share: number): number {
  return Math.round(share * 10_000) / 10_000;
}
