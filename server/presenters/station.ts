import type { InstrumentTokenView, StationView } from '../../shared/schemas/stations';
import type { InstrumentToken } from '../models/instrument-token';
import type { Station } from '../models/station';

/** An instrument token as the API shows it: its prefix, never the token or its hash. */
export function presentToken(t: InstrumentToken): InstrumentTokenView {
  return {
    id: t.id,
    stationId: t.stationId,
    name: t.name,
    prefix: t.tokenPrefix,
    eventTypes: t.eventTypes,
    createdAt: t.createdAt.toISOString(),
    revokedAt: t.revokedAt ? t.revokedAt.toISOString() : null,
    lastUsedAt: t.lastUsedAt ? t.lastUsedAt.toISOString() : null,
  };
}

/** A station as the API shows it; tokens only when given. */
export function presentStation(s: Station, tokens?: InstrumentToken[], activeTokens = 0): StationView {
  return {
    id: s.id,
    code: s.code,
    name: s.name,
    kind: s.kind,
    active: s.active,
    activeTokens: tokens ? tokens.filter((t) => !t.revokedAt).length : activeTokens,
    ...(tokens ? { tokens: tokens.map(presentToken) } : {}),
  };
}
