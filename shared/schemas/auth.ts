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

/**
 * What a person means by an electronic signature. The statement is shown before they type their
 * password, and the ledger event of the signed action records the meaning.
 */
export const SIGNATURE_MEANINGS = {
  void: 'I confirm that the event I am voiding was recorded in error, and that the correction is mine.',
  disposal: 'I confirm that the listed items may be disposed of under the retention rule, and that I dispose of them.',
  return: 'I confirm that the listed items are returned to the customer, and that I hand them over.',
  override: 'I approve an exception to the normal sequence, and I take responsibility for it.',
  report: 'I approve these results for release to the customer.',
  'hold-release': 'I release these items from hold; the reason for the hold has been resolved.',
} as const;
export type SignatureMeaning = keyof typeof SIGNATURE_MEANINGS;
export const SIGNATURE_MEANING_KEYS = Object.keys(SIGNATURE_MEANINGS) as [SignatureMeaning, ...SignatureMeaning[]];

/** How long a signature token lives before the action must be taken. */
export const SIGNATURE_TTL_SECONDS = 5 * 60;

/** POST /api/auth/signature: the password again, and the meaning of the signature. */
export const SignatureSchema = z.object({
  password: z.string().min(1, 'Enter your password to sign.'),
  meaning: z.enum(SIGNATURE_MEANING_KEYS, { message: `Meaning must be one of: ${SIGNATURE_MEANING_KEYS.join(', ')}.` }),
});
export type SignatureBody = z.infer<typeof SignatureSchema>;

/** The answer of POST /api/auth/signature. */
export interface SignatureResponse {
  signatureToken: string;
  meaning: SignatureMeaning;
  statement: string;
  expiresAt: string;
}

/** POST /api/auth/password-reset: always the same answer, whether the address is known or not. */
export const ResetRequestSchema = z.object({ email: EmailSchema });
export type ResetRequestBody = z.infer<typeof ResetRequestSchema>;

const LinkTokenSchema = z.string().trim().regex(/^[A-Za-z0-9_-]{20,100}$/, 'This link is not complete. Copy the whole link from the e-mail.');

/** POST /api/auth/link: what an e-mailed link is for, before the password form shows. */
export const LinkInfoSchema = z.object({ token: LinkTokenSchema });
export type LinkInfoBody = z.infer<typeof LinkInfoSchema>;

/** POST /api/auth/set-password: spend an invite or reset link to choose a password. */
export const SetPasswordSchema = z.object({ token: LinkTokenSchema, password: NewPasswordSchema });
export type SetPasswordBody = z.infer<typeof SetPasswordSchema>;

/** The answer of POST /api/auth/link. */
export interface LinkInfoResponse {
  purpose: 'invite' | 'reset';
  email: string;
  name: string;
  expiresAt: string;
}

/** One message the stand-in SMTP server received, as the development outbox shows it. */
export interface OutboxMessageView {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}
