import { paths } from '../../config/paths';

/** One entry of the main navigation. */
export interface NavItem {
  to: string;
  label: string;
  glyph: string;
}

/** The main navigation; screens add themselves here. */
export function navItems(): NavItem[] {
  return [{ to: paths.home.path, label: paths.home.label, glyph: '◆' }];
}
