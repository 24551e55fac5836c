import { z } from 'zod';
import { ROLES } from './roles.js';

export const email = z.string().trim().toLowerCase().max(254, 'Use at most 254 characters').pipe(z.email({ message: 'Enter a valid e-mail address' }));

/** Passphrases rather than complexity rules: length is what resists guessing (NIST SP 800-63B §5.1.1). */
export const newPassword = z
  .string()
  .min(12, 'Use at least 12 characters')
  .max(256, 'Use at most 256 characters');

export const loginBody = z.object({ email, password: z.string().min(1, 'Enter your password').max(256) });
export const resetRequestBody = z.object({ email });
export const resetConfirmBody = z.object({ token: z.string().min(20).max(200), password: newPassword });
export const changePasswordBody = z.object({ currentPassword: z.string().min(1).max(256), newPassword });

export const invitationBody = z.object({
  email,
  role: z.enum(ROLES),
  name: z.string().trim().max(120).optional(),
});
export const acceptInvitationBody = z.object({
  token: z.string().min(20).max(200),
  name: z.string().trim().min(1, 'Enter your name').max(120),
  password: newPassword,
});
export const userPatchBody = z
  .object({
    role: z.enum(ROLES).optional(),
    active: z.boolean().optional(),
    name: z.string().trim().min(1).max(120).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change: send role, active or name' });

export const publicUser = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
  active: z.boolean(),
});
export type PublicUser = z.infer<typeof publicUser>;

export type LoginBody = z.infer<typeof loginBody>;
export type InvitationBody = z.infer<typeof invitationBody>;
export type AcceptInvitationBody = z.infer<typeof acceptInvitationBody>;
