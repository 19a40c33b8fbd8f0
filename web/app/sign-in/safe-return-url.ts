/**
 * The address to go back to after signing in, if it is a path inside this application.
 * Anything else (another origin, a protocol-relative "//host" URL) falls back to home, so a
 * crafted link cannot send someone elsewhere after they sign in.
 */
export function safeReturnUrl(returnUrl: string | null | undefined): string {
  if (!returnUrl || !returnUrl.startsWith('/') || returnUrl.startsWith('//')) return '/';
  if (returnUrl.startsWith('/\\') || returnUrl.startsWith('/sign-in')) return '/';
  return returnUrl;
}
