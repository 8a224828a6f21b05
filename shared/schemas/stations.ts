import { z } from 'zod';
import { EVENT_TYPES } from '../domain/ledger/state-machine';

/** Kinds of station, as the database allows them. */
export const STATION_KINDS = ['saw', 'mill', 'conditioning', 'gauge', 'frame', 'bins', 'store', 'dispatch', 'other'] as const;
export type StationKind = (typeof STATION_KINDS)[number];

export const STATION_KIND_LABELS: Record<StationKind, string> = {
  saw: 'Saw',
  mill: 'Mill',
  conditioning: 'Conditioning chamber',
  gauge: 'Measuring gauge',
  frame: 'Test frame',
  bins: 'Half bins',
  store: 'Store',
  dispatch: 'Dispatch',
  other: 'Other',
};

const StationKindSchema = z.enum(STATION_KINDS, { message: `Kind must be one of: ${STATION_KINDS.join(', ')}.` });
const StationNameSchema = z.string().trim().min(1, 'Enter a name.').max(120, 'Keep the name under 120 characters.');

/** POST /api/stations. Codes are short, upper-case, and what a fixed scanner is set to. */
export const CreateStationSchema = z.object({
  code: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z][A-Z0-9-]{1,23}$/, 'A station code is 2–24 letters, digits or dashes, starting with a letter, like FRAME-2.'),
  name: StationNameSchema,
  kind: StationKindSchema,
});
export type CreateStationBody = z.infer<typeof CreateStationSchema>;

/** PATCH /api/stations/:id: the code stays, because events and tokens refer to it. */
export const UpdateStationSchema = z
  .object({ name: StationNameSchema.optional(), kind: StationKindSchema.optional(), active: z.boolean().optional() })
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'Send at least one of name, kind or active.' });
export type UpdateStationBody = z.infer<typeof UpdateStationSchema>;

/** POST /api/stations/:id/tokens: the event types the instrument may post, chosen by a manager. */
export const CreateInstrumentTokenSchema = z.object({
  name: z.string().trim().min(1, 'Name the instrument, like "Cell 1 robot".').max(120),
  eventTypes: z
    .array(z.enum(EVENT_TYPES, { message: `Each event type must be one of: ${EVENT_TYPES.join(', ')}.` }))
    .min(1, 'Choose at least one event type the instrument may post.')
    .refine((a) => new Set(a).size === a.length, 'List each event type once.'),
});
export type CreateInstrumentTokenBody = z.infer<typeof CreateInstrumentTokenSchema>;

/** An instrument token as the API shows it: never the token or its hash. */
export interface InstrumentTokenView {
  id: number;
  stationId: number;
  name: string;
  prefix: string;
  eventTypes: string[];
  createdAt: string;
  revokedAt: string | null;
  lastUsedAt: string | null;
}

/** A station as the API shows it, with its tokens on the detail answer. */
export interface StationView {
  id: number;
  code: string;
  name: string;
  kind: StationKind;
  active: boolean;
  activeTokens: number;
  tokens?: InstrumentTokenView[];
}

/** GET /api/stations query. */
export const StationListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  active: z.enum(['true', 'false']).optional(),
});
