import { z } from 'zod';
import { ROLES } from '../permissions';

export const EmailSchema = z.string().trim().toLowerCase().email('Enter a valid e-mail address, like name@lab.example.');
export const RoleSchema = z.enum(ROLES, { message: `Role must be one of: ${ROLES.join(', ')}.` });

export const LoginSchema = z.object({
  email: EmailSchema,
  password: z.string().min(1, 'Enter your password.'),
});
export type LoginBody = z.infer<typeof LoginSchema>;
