/** The scanner's own requests: switching the operator at a shared station. */
import { z } from 'zod';
import type { Role } from '../permissions';
import { codeSchemaFor } from '../domain/codes';

/** A station PIN: 4 to 8 digits, as set on one's own account. */
export const StationPinSchema = z.string({ error: 'Type your PIN.' }).regex(/^\d{4,8}$/, { error: 'A PIN is 4 to 8 digits.' });

/** POST /api/auth/station-operator: the badge scanned at the station and its holder's PIN; both are needed. */
export const StationOperatorSchema = z.strictObject({
  badgeCode: codeSchemaFor('badge'),
  pin: StationPinSchema,
});

/** The body of POST /api/auth/station-operator. */
export type StationOperatorInput = z.input<typeof StationOperatorSchema>;

/** The operator a station now records events for. */
export interface StationOperatorView {
  id: number;
  name: string;
  role: Role;
}

/** The answer of POST /api/auth/station-operator: the operator token to send as X-Operator-Token. */
export interface StationOperatorResponse {
  token: string;
  /** ISO instant after which the token is refused and the badge and PIN are asked again. */
  expiresAt: string;
  operator: StationOperatorView;
}

/** The header that carries an operator token on event posts from a shared station. */
export const OPERATOR_TOKEN_HEADER = 'X-Operator-Token';
