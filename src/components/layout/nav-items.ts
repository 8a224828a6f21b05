import type { Action } from '../../../shared/permissions';
import { paths } from '../../config/paths';

/** One entry of the main navigation; `requires` hides it from users whose role may not take that action. */
export interface NavItem {
  to: string;
  label: string;
  glyph: string;
  requires?: Action;
}

/** The main navigation; screens add themselves here with the action they need. */
export const NAV_ITEMS: readonly NavItem[] = [
  { to: paths.home.path, label: paths.home.label, glyph: '◆' },
  { to: paths.scan.path, label: paths.scan.label, glyph: '◎', requires: 'events.record' },
  { to: '/trace', label: paths.trace.label, glyph: '⇠', requires: 'lab.read' },
  { to: paths.anomalies.path, label: paths.anomalies.label, glyph: '△', requires: 'lab.read' },
  { to: paths.labels.path, label: paths.labels.label, glyph: '⎙', requires: 'labels.print' },
  { to: paths.orders.path, label: paths.orders.label, glyph: '▤', requires: 'lab.read' },
  { to: paths.specimens.path, label: paths.specimens.label, glyph: '◧', requires: 'lab.read' },
  { to: paths.heats.path, label: paths.heats.label, glyph: '♨', requires: 'lab.read' },
  { to: paths.samples.path, label: paths.samples.label, glyph: '▱', requires: 'lab.read' },
  { to: paths.customers.path, label: paths.customers.label, glyph: '◎', requires: 'lab.read' },
  { to: paths.results.path, label: paths.results.label, glyph: '∿', requires: 'lab.read' },
  { to: paths.specifications.path, label: paths.specifications.label, glyph: '≥', requires: 'lab.read' },
  { to: paths.users.path, label: paths.users.label, glyph: '☷', requires: 'users.read' },
  { to: paths.stations.path, label: paths.stations.label, glyph: '▣', requires: 'stations.write' },
  { to: paths.store.path, label: paths.store.label, glyph: '▭', requires: 'lab.read' },
  { to: paths.retention.path, label: paths.retention.label, glyph: '◷', requires: 'lab.read' },
  { to: paths.disposals.path, label: paths.disposals.label, glyph: '⌫', requires: 'disposals.write' },
  { to: paths.outbox.path, label: paths.outbox.label, glyph: '✉', requires: 'outbox.read' },
];

/** The navigation a user sees: only items whose action the server lists in their permissions. */
export function navItems(permissions: readonly string[] = []): NavItem[] {
  return NAV_ITEMS.filter((item) => !item.requires || permissions.includes(item.requires));
}
