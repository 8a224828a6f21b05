/**
 * Scans kept on the device until the ledger has them. Every scan is written here as it is sent
 * and removed once the server's answer is on screen, so a lost connection or a closed tab loses nothing;
 * the idempotency key made at scan time means a resend is never recorded twice.
 */
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { EventType } from '../../../shared/domain/ledger/state-machine';

/** A custody event as the scanner posts it (a subset of the API's EventInput). */
export interface ScanEvent {
  idempotencyKey: string;
  type: EventType;
  itemCode: string;
  occurredAt: string;
  payload: Record<string, unknown>;
  stationCode?: string;
  containerCode?: string;
}

/** One scan waiting for the ledger. */
export interface QueuedScan {
  /** The event's idempotency key, also the record's key. */
  key: string;
  event: ScanEvent;
  /** The shared-station operator the scan belongs to, and their token, if any. */
  operatorToken: string | null;
  operatorName: string | null;
  /** The action's plain words, for the pending list. */
  label: string;
  /** Why the last sync could not deliver it (kept for the next try), if it failed. */
  lastProblem?: string;
}

interface ScanDb extends DBSchema {
  pending: { key: string; value: QueuedScan; indexes: { byTime: string } };
}

const DB_NAME = 'halfmark-scanner';
let db: Promise<IDBPDatabase<ScanDb>> | null = null;

function open(): Promise<IDBPDatabase<ScanDb>> {
  db ??= openDB<ScanDb>(DB_NAME, 1, {
    upgrade(database) {
      const store = database.createObjectStore('pending', { keyPath: 'key' });
      store.createIndex('byTime', 'event.occurredAt');
    },
  });
  return db;
}

/** Keeps a scan on the device. */
export async function keepScan(scan: QueuedScan): Promise<void> {
  await (await open()).put('pending', scan);
}

/** Forgets a scan the ledger has answered (recorded, replayed or refused). */
export async function forgetScan(key: string): Promise<void> {
  await (await open()).delete('pending', key);
}

/** Notes why a scan could not be delivered yet. */
export async function markScan(key: string, problem: string): Promise<void> {
  const database = await open();
  const scan = await database.get('pending', key);
  if (scan) await database.put('pending', { ...scan, lastProblem: problem });
}

/** Every scan still waiting, oldest first by device time. */
export async function pendingScans(): Promise<QueuedScan[]> {
  return (await open()).getAllFromIndex('pending', 'byTime');
}
