import { z } from 'zod';
import { ROLES, type Action } from '../permissions';
import type { UserView } from './users';

export const EmailSchema = z.string().trim().toLowerCase().email('Enter a valid e-mail address, like name@lab.example.');
export const RoleSchema = z.enum(ROLES, { message: `Role must be one of: ${ROLES.join(', ')}.` });

/** The shortest password Halfmark accepts; length beats composition rules. */
export const MIN_PASSWORD_LENGTH = 12;
export const NewPasswordSchema = z
  .string()
  .min(MIN_PASSWORD_LENGTH, `A password needs at least ${MIN_PASSWORD_LENGTH} characters.`)
  .max(200, 'Keep the password under 200 characters.');

export const LoginSchema = z.object({
  email: EmailSchema,
  password: z.string().min(1, 'Enter your password.'),
});
export type LoginBody = z.infer<typeof LoginSchema>;

/** The answer of GET /api/auth/me and of a sign-in: who I am and the actions my role may take. */
export interface MeResponse {
  user: UserView;
  permissions: Action[];
}
