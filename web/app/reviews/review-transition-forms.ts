import { FormControl, FormGroup, Validators, type AbstractControl, type ValidationErrors, type ValidatorFn } from '@angular/forms';
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

/**
 * A mitigation must name a measure the engine can re-run with: a descent speed cap or an SOC
 * ceiling. A vehicle restriction or a mandatory retarder may go with it; on their own they are
 * not modelled, and the item goes to a signed-off risk acceptance instead (the server's rule).
 */
export const modelledMeasure: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const value = (group as MitigationForm).getRawValue();
  const hasModelled = value.descentSpeedCapKph !== null || value.socCeilingPercent !== null;
  return hasModelled ? null : { noModelledMeasure: true };
};

export type MitigationForm = ReturnType<typeof mitigationForm>;

/** "Record mitigation": the measures (km/h and % as people type them) and a note; always re-run. */
export function mitigationForm() {
  return new FormGroup(
    {
      descentSpeedCapKph: new FormControl<number | null>(null, [Validators.min(SPEED_LIMIT_KPH.min), Validators.max(SPEED_LIMIT_KPH.max)]),
      socCeilingPercent: new FormControl<number | null>(null, [Validators.min(5), Validators.max(100)]),
      vehicleRestriction: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(500)] }),
      mandatoryRetarder: new FormControl(false, { nonNullable: true }),
      note: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(NOTE_MAX_LENGTH)] }),
    },
    { validators: [modelledMeasure] },
  );
}

/** "Propose risk acceptance": a reason of at least ten characters, for a second officer to sign off. */
export function acceptForm() {
  return new FormGroup({
    reason: new FormControl('', {
      nonNullable: true,
      validators: [trimmedMinLength(ACCEPT_REASON_MIN_LENGTH), Validators.maxLength(NOTE_MAX_LENGTH)],
    }),
  });
}

/** "Send back": why a proposed acceptance goes back to review. */
export function declineForm() {
  return new FormGroup({
    note: new FormControl('', {
      nonNullable: true,
      validators: [trimmedMinLength(REOPEN_NOTE_MIN_LENGTH), Validators.maxLength(NOTE_MAX_LENGTH)],
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
    rerun: true,
  });
}

export function acceptRequest(form: ReturnType<typeof acceptForm>): ReviewTransitionRequest {
  return reviewTransitionRequestSchema.parse({ action: 'accept', reason: form.getRawValue().reason.trim() });
}

export function declineRequest(form: ReturnType<typeof declineForm>): ReviewTransitionRequest {
  return reviewTransitionRequestSchema.parse({ action: 'decline', note: form.getRawValue().note.trim() });
}

export function reopenRequest(form: ReturnType<typeof reopenForm>): ReviewTransitionRequest {
  return reviewTransitionRequestSchema.parse({ action: 'reopen', note: form.getRawValue().note.trim() });
}

/** 0.8 stays 0.8, not 0.8000000000000002. */
function roundShare(share: number): number {
  return Math.round(share * 10_000) / 10_000;
}
