import { TestBed } from '@angular/core/testing';
import { PasswordStrength, passwordStrength } from '../../../web/app/ui/password-strength';

describe('passwordStrength', () => {
  it('refuses a short password with the shared rule', () => {
    expect(passwordStrength('short')).toEqual({ level: 'refused', message: 'Use at least 12 characters.' });
  });

  it('refuses a common password', () => {
    expect(passwordStrength('Password1234').level).toBe('refused');
  });

  it("refuses a password containing the e-mail address's name", () => {
    expect(passwordStrength('xx-hannelore-xx', 'hannelore@descentry.example').message).toBe('Do not use your e-mail name in the password.');
  });

  it('accepts 12 varied characters and calls 16 or more strong', () => {
    expect(passwordStrength('gravel-switch').level).toBe('acceptable');
    expect(passwordStrength('gravel-switchback-pass').level).toBe('strong');
  });
});

describe('PasswordStrength', () => {
  it('updates its feedback as the password changes', async () => {
    const fixture = TestBed.createComponent(PasswordStrength);
    fixture.componentRef.setInput('password', 'aaaaaaaaaaaaaa');
    await fixture.whenStable();
    const feedback = () => (fixture.nativeElement as HTMLElement).querySelector('[data-testid="password-strength"]')?.textContent ?? '';
    const level = () => (fixture.nativeElement as HTMLElement).querySelector('.meter')?.getAttribute('data-level');

    expect(feedback()).toContain('Use more different characters.');
    expect(level()).toBe('refused');

    fixture.componentRef.setInput('password', 'ridge-line-descent-9');
    await fixture.whenStable();

    expect(feedback()).toContain('Strong password.');
    expect(level()).toBe('strong');
  });
});
