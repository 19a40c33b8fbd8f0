import {
  acceptForm,
  acceptRequest,
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
      expect(form.hasError('noMeasure')).toBe(true);
    });

    it('does not take a vehicle restriction of only spaces as a measure', () => {
      const form = mitigationForm();

      form.controls.vehicleRestriction.setValue('   ');

      expect(form.hasError('noMeasure')).toBe(true);
    });

    it.each([
      ['a descent speed cap', { descentSpeedCapKph: 25 }],
      ['an SOC ceiling', { socCeilingPercent: 60 }],
      ['a vehicle restriction', { vehicleRestriction: 'No drum-braked buses' }],
      ['a mandatory retarder', { mandatoryRetarder: true }],
    ])('is valid with %s alone', (_name, measure) => {
      const form = mitigationForm();

      form.patchValue(measure);

      expect(form.valid).toBe(true);
    });

    it('refuses a speed cap outside 5–130 km/h', () => {
      const form = mitigationForm();

      form.patchValue({ descentSpeedCapKph: 3 });

      expect(form.controls.descentSpeedCapKph.errors).toHaveProperty('min');
    });

    it('sends the SOC ceiling as a share, only the measures given, and the re-run choice', () => {
      const form = mitigationForm();

      form.patchValue({ descentSpeedCapKph: 25, socCeilingPercent: 80, note: ' Posted 25 km/h signs ', rerun: true });

      expect(mitigateRequest(form)).toEqual({
        action: 'mitigate',
        mitigation: { descentSpeedCapKph: 25, socCeiling: 0.8 },
        note: 'Posted 25 km/h signs',
        rerun: true,
      });
    });
  });

  it('needs a note to reopen', () => {
    const form = reopenForm();

    expect(form.invalid).toBe(true);
    form.controls.note.setValue('Rerun with the new bus profile');
    expect(form.valid).toBe(true);
  });
});
