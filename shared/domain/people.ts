import * as z from 'zod';
import { emailSchema } from './auth';
import { roleSchema } from './roles';

export const PERSON_STATUSES = ['invited', 'active', 'disabled'] as const;
export const personStatusSchema = z.enum(PERSON_STATUSES);

/** A person as the administrator sees them. */
export const personSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  status: personStatusSchema,
  createdAt: z.iso.datetime({ offset: true }),
  lastSignInAt: z.iso.datetime({ offset: true }).nullable(),
  /**
   * Failed sign-ins counted against the account from browsers it has not signed in from, and
   * until when such sign-ins must wait (null: not slowed down). An administrator can lift it.
   */
  signIn: z.object({
    failedAttempts: z.number().int().min(0),
    slowedUntil: z.iso.datetime({ offset: true }).nullable(),
  }),
});
export type Person = z.infer<typeof personSchema>;

export const personListSchema = z.object({ items: z.array(personSchema) });
export type PersonList = z.infer<typeof personListSchema>;

export const inviteRequestSchema = z.object({
  email: emailSchema,
  name: z.string().trim().min(1).max(120),
  role: roleSchema,
});
export type InviteRequest = z.infer<typeof inviteRequestSchema>;

export const updatePersonRequestSchema = z
  .object({
    role: roleSchema.optional(),
    status: z.enum(['active', 'disabled']).optional(),
    name: z.string().trim().min(1).max(120).optional(),
  })
  .refine((update) => Object.keys(update).length > 0, 'Name at least one of role, status, name');
export type UpdatePersonRequest = z.infer<typeof updatePersonRequestSchema>;

export const personIdParamsSchema = z.object({ personId: z.uuid() });
