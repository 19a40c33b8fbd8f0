import * as z from 'zod';
import { MAX_PASSWORD_LENGTH, passwordWeakness } from './password-strength';
import { roleSchema } from './roles';

export const emailSchema = z
  .email()
  .max(254)
  .transform((email) => email.toLowerCase());

export const userSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
});
export type User = z.infer<typeof userSchema>;

export const loginRequestSchema = z.object({
  email: emailSchema,
  password: z.string().min(1).max(MAX_PASSWORD_LENGTH),
});
export type LoginRequest = z.infer<typeof loginRequestSchema>;

export const userResponseSchema = z.object({ user: userSchema });
export type UserResponse = z.infer<typeof userResponseSchema>;

/**
 * GET /api/auth/session: who is signed in on this browser, `null` when nobody is. Answers 200 either
 * way, so the app's first look at the session is not logged as a failed request before sign-in.
 */
export const sessionResponseSchema = z.object({ user: userSchema.nullable() });
export type SessionResponse = z.infer<typeof sessionResponseSchema>;

/** A new password: checked with the same rules in the browser and on the server. */
export const newPasswordSchema = z
  .string()
  .max(MAX_PASSWORD_LENGTH)
  .superRefine((password, context) => {
    const weakness = passwordWeakness(password);
    if (weakness) context.addIssue({ code: 'custom', message: weakness });
  });

export const changePasswordRequestSchema = z.object({
  currentPassword: z.string().min(1).max(MAX_PASSWORD_LENGTH),
  newPassword: newPasswordSchema,
});
export type ChangePasswordRequest = z.infer<typeof changePasswordRequestSchema>;

/** Single-use tokens sent by e-mail (invitation or password reset). */
export const accountTokenSchema = z.string().min(20).max(200);

export const tokenInfoRequestSchema = z.object({ token: accountTokenSchema });
export const tokenInfoResponseSchema = z.object({
  kind: z.enum(['invite', 'reset']),
  email: z.string(),
  name: z.string(),
});
export type TokenInfoResponse = z.infer<typeof tokenInfoResponseSchema>;

export const setPasswordWithTokenRequestSchema = z.object({
  token: accountTokenSchema,
  password: newPasswordSchema,
});
export type SetPasswordWithTokenRequest = z.infer<typeof setPasswordWithTokenRequestSchema>;

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export type PasswordResetRequest = z.infer<typeof passwordResetRequestSchema>;
