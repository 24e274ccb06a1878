import { z } from 'zod';

export const USER_ROLES = ['nurse', 'lead', 'safety', 'admin'] as const;

/** No text Plateau stores may hold NUL (U+0000): PostgreSQL cannot store it. */
const noNul = (s: string) => !s.includes('\u0000');
const NUL_MESSAGE = { message: 'must not contain a NUL character' };

export const NewUserInput = z.object({
  username: z
    .string()
    .trim()
    .min(3, { message: 'must be at least 3 characters' })
    .max(40, { message: 'must be at most 40 characters' })
    .regex(/^[a-z0-9._-]+$/, { message: 'may use only lower-case letters, digits, dot, dash and underscore' }),
  displayName: z.string().trim().min(1, { message: 'is required' }).max(80, { message: 'must be at most 80 characters' }).refine(noNul, NUL_MESSAGE),
  role: z.enum(USER_ROLES, { message: `must be one of ${USER_ROLES.join(', ')}` }),
  password: z.string().max(200, { message: 'must be at most 200 characters' }).refine(noNul, NUL_MESSAGE),
});
export type NewUserInput = z.infer<typeof NewUserInput>;

export const SignInInput = z.object({
  username: z.string().trim().min(1, { message: 'is required' }).max(40, { message: 'is too long' }).refine(noNul, NUL_MESSAGE),
  password: z.string().min(1, { message: 'is required' }).max(200, { message: 'is too long' }).refine(noNul, NUL_MESSAGE),
});
export type SignInInput = z.infer<typeof SignInInput>;
