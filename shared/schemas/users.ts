import { z } from 'zod';
import { ROLES } from '../permissions';
import { EmailSchema, NewPasswordSchema, RoleSchema } from './auth';

/** A user as the API shows it: never the hashes. */
export interface UserView {
  id: number;
  email: string;
  name: string;
  role: (typeof ROLES)[number];
  active: boolean;
  badgeCode: string | null;
  locked: boolean;
  invited: boolean;
  hasPin: boolean;
  createdAt: string;
}

const NameSchema = z.string().trim().min(1, 'Enter a name.').max(120, 'Keep the name under 120 characters.');

/** POST /api/users: a manager invites someone; they get an e-mail with a link to set a password. */
export const InviteUserSchema = z.object({
  email: EmailSchema,
  name: NameSchema,
  role: RoleSchema,
});
export type InviteUserBody = z.infer<typeof InviteUserSchema>;

/** PATCH /api/users/:id: what a manager may change about someone else. */
export const UpdateUserSchema = z
  .object({
    name: NameSchema.optional(),
    role: RoleSchema.optional(),
    active: z.boolean().optional(),
  })
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'Send at least one of name, role or active.' });
export type UpdateUserBody = z.infer<typeof UpdateUserSchema>;

export const USER_SORTS = ['name', '-name', 'email', '-email', 'role', '-role', 'createdAt', '-createdAt'] as const;

/** GET /api/users query: search, sort, page, and filters; all optional. */
export const UserListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  role: RoleSchema.optional(),
  active: z.enum(['true', 'false']).optional(),
  sort: z.enum(USER_SORTS, { message: `Sort must be one of: ${USER_SORTS.join(', ')}.` }).default('name'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type UserListQuery = z.infer<typeof UserListQuerySchema>;

/** A page of any list the API answers. */
export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

/** PUT /api/users/me/pin: a 4–8 digit PIN for switching operator at a shared station. */
export const SetPinSchema = z.object({
  password: z.string().min(1, 'Enter your current password.'),
  pin: z.string().regex(/^\d{4,8}$/, 'A PIN is 4 to 8 digits.'),
});
export type SetPinBody = z.infer<typeof SetPinSchema>;

/** POST /api/users/me/password: change one's own password; other sessions end. */
export const ChangePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password.'),
  newPassword: NewPasswordSchema,
});
export type ChangePasswordBody = z.infer<typeof ChangePasswordSchema>;

/** `:id` in a route path: a positive whole number. */
export const IdParamsSchema = z.object({ id: z.coerce.number().int().positive('The id in the address must be a positive whole number.') });
