/**
 * What this device remembers between visits: a fixed station (its code and its one action), and,
 * for the current tab only, the operator who last scanned their badge here.
 */
import { isEventType, type EventType } from '../../../shared/domain/ledger/state-machine';
import type { StationOperatorResponse } from '../../../shared/schemas/scan';

/** A fixed station: every scan here records one action at one station. */
export interface FixedStation {
  stationCode: string;
  action: EventType;
}

const STATION_KEY = 'halfmark.scan.station';
const OPERATOR_KEY = 'halfmark.scan.operator';

/** After this long without a scan the station forgets its operator, so the next person must badge in. */
export const OPERATOR_IDLE_MS = 15 * 60 * 1000;

/** The fixed station set up on this device, if any. */
export function loadStation(): FixedStation | null {
  try {
    const value = JSON.parse(localStorage.getItem(STATION_KEY) ?? 'null') as Partial<FixedStation> | null;
    if (value && typeof value.stationCode === 'string' && typeof value.action === 'string' && isEventType(value.action)) {
      return { stationCode: value.stationCode, action: value.action };
    }
  } catch {
    // A damaged entry is as good as none.
  }
  return null;
}

/** Remembers (or, with null, forgets) the fixed station on this device. */
export function saveStation(station: FixedStation | null): void {
  if (station) localStorage.setItem(STATION_KEY, JSON.stringify(station));
  else localStorage.removeItem(STATION_KEY);
}

/** The operator working at this station now, with their pass. */
export interface StationOperator extends StationOperatorResponse {
  /** Last scan or badge-in, ms since the epoch; the idle limit counts from here. */
  lastActive: number;
}

/** The current operator, unless their pass expired or they were idle too long. */
export function loadOperator(now = Date.now()): StationOperator | null {
  try {
    const value = JSON.parse(sessionStorage.getItem(OPERATOR_KEY) ?? 'null') as StationOperator | null;
    if (value && Date.parse(value.expiresAt) > now && now - value.lastActive < OPERATOR_IDLE_MS) return value;
  } catch {
    // Fall through: no operator.
  }
  sessionStorage.removeItem(OPERATOR_KEY);
  return null;
}

/** Remembers the operator for this tab (or forgets them, with null). */
export function saveOperator(operator: StationOperator | null): void {
  if (operator) sessionStorage.setItem(OPERATOR_KEY, JSON.stringify(operator));
  else sessionStorage.removeItem(OPERATOR_KEY);
}

/** A random idempotency key: a version 4 UUID, also where crypto.randomUUID is missing (plain http on a LAN). */
export function newKey(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = ((b[6] ?? 0) & 0x0f) | 0x40;
  b[8] = ((b[8] ?? 0) & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}
