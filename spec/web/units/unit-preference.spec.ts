import { TestBed } from '@angular/core/testing';
import { UNIT_SYSTEM_STORAGE_KEY, UnitPreference } from '../../../web/app/units/unit-preference';

describe('UnitPreference', () => {
  afterEach(() => localStorage.removeItem(UNIT_SYSTEM_STORAGE_KEY));

  it('starts metric when nothing is stored', () => {
    expect(TestBed.inject(UnitPreference).system()).toBe('metric');
  });

  it('remembers the choice in localStorage', () => {
    TestBed.inject(UnitPreference).choose('imperial');

    expect(localStorage.getItem(UNIT_SYSTEM_STORAGE_KEY)).toBe('imperial');
  });

  it('reads a stored choice at start', () => {
    localStorage.setItem(UNIT_SYSTEM_STORAGE_KEY, 'imperial');

    expect(TestBed.inject(UnitPreference).system()).toBe('imperial');
  });

  it('ignores a stored value it does not know', () => {
    localStorage.setItem(UNIT_SYSTEM_STORAGE_KEY, 'cubits');

    expect(TestBed.inject(UnitPreference).system()).toBe('metric');
  });
});
