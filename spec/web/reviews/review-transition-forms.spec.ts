import {
  acceptForm,
  acceptRequest,
  declineForm,
  declineRequest,
  mitigateRequest,
  mitigationForm,
  reopenForm,
} from '../../../web/app/reviews/review-transition-forms';

describe('review transition forms', () => {
  describe('accept risk', () => {
    it('is invalid when the reason is shorter than 10 characters', () => {
      const form = acceptForm();

      form.controls.reason.setValue('too short');

      expect(form.invalid).toBe(true);
      expect(form.controls.reason.errors).toHaveProperty('trimmedMinLength');
    });

    it('does not count spaces around the reason', () => {
      const form = acceptForm();

      form.controls.reason.setValue('   nine chr    ');

      expect(form.invalid).toBe(true);
    });

    it('is valid with 10 characters and sends the trimmed reason', () => {
      const form = acceptForm();

      form.controls.reason.setValue('  Retarder fitted on all  ');

      expect(form.valid).toBe(true);
      expect(acceptRequest(form)).toEqual({ action: 'accept', reason: 'Retarder fitted on all' });
    });
  });

  describe('record mitigation', () => {
    it('is invalid without any measure, even with a note', () => {
      const form = mitigationForm();

      form.controls.note.setValue('Talked to the depot');

      expect(form.invalid).toBe(true);
      expect(form.hasError('noModelledMeasure')).toBe(true);
    });

    it.each([
      ['a vehicle restriction', { vehicleRestriction: 'No drum-braked buses' }],
      ['a mandatory retarder', { mandatoryRetarder: true }],
    ])('is invalid with only %s, which the model does not represent', (_name, measure) => {
      const form = mitigationForm();

      form.patchValue(measure);

      expect(form.hasError('noModelledMeasure')).toBe(true);
    });

    it.each([
      ['a descent speed cap', { descentSpeedCapKph: 25 }],
      ['an SOC ceiling', { socCeilingPercent: 60 }],
      ['a speed cap with a vehicle restriction', { descentSpeedCapKph: 25, vehicleRestriction: 'No drum-braked buses' }],
    ])('is valid with %s', (_name, measure) => {
      const form = mitigationForm();

      form.patchValue(measure);

      expect(form.valid).toBe(true);
    });

    it('refuses a speed cap outside 5–130 km/h', () => {
      const form = mitigationForm();

      form.patchValue({ descentSpeedCapKph: 3 });

      expect(form.controls.descentSpeedCapKph.errors).toHaveProperty('min');
    });

    it('sends the SOC ceiling as a share, only the measures given, always with a re-run', () => {
      const form = mitigationForm();

      form.patchValue({ descentSpeedCapKph: 25, socCeilingPercent: 80, note: ' Posted 25 km/h signs ' });

      expect(mitigateRequest(form)).toEqual({
        action: 'mitigate',
        mitigation: { descentSpeedCapKph: 25, socCeiling: 0.8 },
        note: 'Posted 25 km/h signs',
        rerun: true,
      });
    });
  });

  it('needs a note to send a proposed acceptance back', () => {
    const form = declineForm();

    expect(form.invalid).toBe(true);
    form.controls.note.setValue('Training alone is not enough');
    expect(declineRequest(form)).toEqual({ action: 'decline', note: 'Training alone is not enough' });
  });

  it('needs a note to reopen', () => {
    const form = reopenForm();

    expect(form.invalid).toBe(true);
    form.controls.note.setValue('Rerun with the new bus profile');
    expect(form.valid).toBe(true);
  });
});
