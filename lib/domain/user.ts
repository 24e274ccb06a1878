import { z } from 'zod';

export const USER_ROLES = ['nurse', 'lead', 'safety', 'admin'] as const;

export const NewUserInput = z.object({
  username: z
    .string()
    .trim()
    .min(3, { message: 'must be at least 3 characters' })
    .max(40, { message: 'must be at most 40 characters' })
    .regex(/^[a-z0-9._-]+$/, { message: 'may use only lower-case letters, digits, dot, dash and underscore' }),
  displayName: z.string().trim().min(1, { message: 'is required' }).max(80, { message: 'must be at most 80 characters' }),
  role: z.enum(USER_ROLES, { message: `must be one of ${USER_ROLES.join(', ')}` }),
  password: z.string().max(200, { message: 'must be at most 200 characters' }),
});
export type NewUserInput = z.infer<typeof NewUserInput>;

export const SignInInput = z.object({
  username: z.string().trim().min(1, { message: 'is required' }).max(40, { message: 'is too long' }),
  password: z.string().min(1, { message: 'is required' }).max(200, { message: 'is too long' }),
});
export type SignInInput = z.infer<typeof SignInInput>;
