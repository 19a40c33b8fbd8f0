/**
 * Password rules shared by the sign-up pages and the API. Length matters most (NIST SP 800-63B
 * §5.1.1.2 asks for at least 8 characters and no composition rules); we ask for 12 and refuse
 * passwords made of one repeated character or a run from a short list of the most common ones.
 */
export const MIN_PASSWORD_LENGTH = 12;
export const MAX_PASSWORD_LENGTH = 200;

const COMMON_PASSWORDS = new Set([
  'password1234',
  'passwordpassword',
  '123456789012',
  'qwertyuiopas',
  'letmeinletmein',
  'descentry123',
  'descentry1234',
]);

/** Why a password is refused, or null when it is acceptable. */
export function passwordWeakness(password: string, email?: string): string | null {
  if (password.length < MIN_PASSWORD_LENGTH) {
    return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
  }
  if (password.length > MAX_PASSWORD_LENGTH) {
    return `Use at most ${MAX_PASSWORD_LENGTH} characters.`;
  }
  if (new Set(password).size < 5) {
    return 'Use more different characters.';
  }
  if (COMMON_PASSWORDS.has(password.toLowerCase())) {
    return 'This password is too common.';
  }
  if (email && password.toLowerCase().includes(email.split('@')[0]!.toLowerCase())) {
    return 'Do not use your e-mail name in the password.';
  }
  return null;
}
