import type { Action } from '../../../shared/permissions';
import { paths } from '../../config/paths';

/** The groups the main navigation is arranged in, in the order they show. */
export const NAV_SECTIONS = ['Work', 'Intake', 'Results', 'Storage', 'Audit', 'Admin'] as const;
export type NavSection = (typeof NAV_SECTIONS)[number];

/** One entry of the main navigation; `requires` hides it from users whose role may not take that action. */
export interface NavItem {
  to: string;
  label: string;
  section: NavSection;
  requires?: Action;
  /** Shown in the phone's bottom bar (the rest sit behind "More"). */
  bar?: boolean;
}

/** The main navigation; screens add themselves here with the action they need. */
export const NAV_ITEMS: readonly NavItem[] = [
  { to: paths.home.path, label: paths.home.label, section: 'Work', bar: true },
  { to: paths.scan.path, label: paths.scan.label, section: 'Work', requires: 'events.record', bar: true },
  { to: '/trace', label: paths.trace.label, section: 'Work', requires: 'lab.read', bar: true },
  { to: paths.labels.path, label: paths.labels.label, section: 'Work', requires: 'labels.print' },
  { to: paths.orders.path, label: paths.orders.label, section: 'Intake', requires: 'lab.read' },
  { to: paths.specimens.path, label: paths.specimens.label, section: 'Intake', requires: 'lab.read' },
  { to: paths.heats.path, label: paths.heats.label, section: 'Intake', requires: 'lab.read' },
  { to: paths.samples.path, label: paths.samples.label, section: 'Intake', requires: 'lab.read' },
  { to: paths.customers.path, label: paths.customers.label, section: 'Intake', requires: 'lab.read' },
  { to: paths.results.path, label: paths.results.label, section: 'Results', requires: 'lab.read' },
  { to: paths.specifications.path, label: paths.specifications.label, section: 'Results', requires: 'lab.read' },
  { to: paths.store.path, label: paths.store.label, section: 'Storage', requires: 'lab.read' },
  { to: paths.retention.path, label: paths.retention.label, section: 'Storage', requires: 'lab.read' },
  { to: paths.holds.path, label: paths.holds.label, section: 'Storage', requires: 'lab.read' },
  { to: paths.disposals.path, label: paths.disposals.label, section: 'Storage', requires: 'disposals.write' },
  { to: paths.anomalies.path, label: paths.anomalies.label, section: 'Audit', requires: 'lab.read' },
  { to: paths.users.path, label: paths.users.label, section: 'Admin', requires: 'users.read' },
  { to: paths.stations.path, label: paths.stations.label, section: 'Admin', requires: 'stations.write' },
  { to: paths.outbox.path, label: paths.outbox.label, section: 'Admin', requires: 'outbox.read' },
];

/** The navigation a user sees: only items whose action the server lists in their permissions. */
export function navItems(permissions: readonly string[] = []): NavItem[] {
  return NAV_ITEMS.filter((item) => !item.requires || permissions.includes(item.requires));
}

/** The visible items grouped by section, empty sections left out. */
export function navSections(items: readonly NavItem[]): { section: NavSection; items: NavItem[] }[] {
  return NAV_SECTIONS.map((section) => ({ section, items: items.filter((i) => i.section === section) })).filter((g) => g.items.length > 0);
}
