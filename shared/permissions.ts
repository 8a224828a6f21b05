/**
 * Who may do what: declared once here, enforced by the server's authorize() middleware, and read
 * by the client from GET /api/auth/me (never copied into the client).
 */
export const ROLES = ['machinist', 'technician', 'clerk', 'auditor', 'manager'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  machinist: 'Machinist',
  technician: 'Technician',
  clerk: 'Retained-sample clerk',
  auditor: 'Auditor',
  manager: 'Lab manager',
};

/** Every action a route can require. Reads are separate from writes so the auditor can read all. */
export const ACTIONS = [
  'session.self', // own account: change password, read own profile
  'lab.read', // customers, orders, heats, samples, specimens, containers, stations, items, traces
  'intake.write', // create and change customers, orders, heats, samples, specimens, cut lists
  'containers.write', // register containers
  'events.record', // post custody events (scans)
  'events.void', // void an earlier event (signed)
  'labels.print', // print and reprint labels
  'ledger.verify', // recompute chains and seals, export audit packs
  'users.read',
  'users.write', // invite, change role, deactivate, unlock
  'stations.write', // stations and instrument tokens
  'retention.write', // retention rules, holds
  'disposals.write', // signed disposal and return batches
  'results.write', // enter results, issue reports
  'specifications.write', // add specifications to the limits table
  'outbox.read', // the development mail outbox
] as const;
export type Action = (typeof ACTIONS)[number];

const READ: Action[] = ['session.self', 'lab.read', 'ledger.verify'];

export const ROLE_PERMISSIONS: Record<Role, readonly Action[]> = {
  machinist: [...READ, 'intake.write', 'events.record', 'labels.print'],
  technician: [...READ, 'events.record', 'labels.print', 'results.write'],
  clerk: [...READ, 'containers.write', 'events.record', 'labels.print', 'retention.write', 'disposals.write'],
  auditor: [...READ, 'users.read'],
  manager: [...READ, 'intake.write', 'containers.write', 'events.record', 'events.void', 'labels.print',
    'users.read', 'users.write', 'stations.write', 'retention.write', 'disposals.write', 'results.write', 'specifications.write', 'outbox.read'],
};

/** Actions an instrument token may ever take; its event types narrow events.record further. */
export const INSTRUMENT_ACTIONS: readonly Action[] = ['events.record', 'lab.read'];

/** Whether a role may take an action. */
export function can(role: Role, action: Action): boolean {
  return ROLE_PERMISSIONS[role].includes(action);
}
