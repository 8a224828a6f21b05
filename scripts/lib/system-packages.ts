import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';

/** A Debian package the product or its tests need, and how to tell it is present. */
export interface SystemNeed {
  pkg: string;
  present: () => boolean;
}

/** Finds the newest Debian PostgreSQL server binary folder, or null. */
export function findPgBin(): string | null {
  const root = '/usr/lib/postgresql';
  if (!existsSync(root)) return null;
  const versions = readdirSync(root)
    .filter((v) => existsSync(`${root}/${v}/bin/initdb`) && existsSync(`${root}/${v}/bin/pg_ctl`))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? `${root}/${versions[0]}/bin` : null;
}

export const NEEDS = {
  postgresql: { pkg: 'postgresql', present: () => findPgBin() !== null },
  chromium: { pkg: 'chromium', present: () => existsSync('/usr/bin/chromium') },
  popplerUtils: { pkg: 'poppler-utils', present: () => existsSync('/usr/bin/pdftoppm') },
} satisfies Record<string, SystemNeed>;

const isRoot = () => typeof process.getuid === 'function' && process.getuid() === 0;

/**
 * Makes sure the Debian packages are installed: as root it installs the missing ones with
 * apt-get; otherwise it stops with a message naming exactly what to install.
 */
export function ensureSystemPackages(needs: SystemNeed[], why: string): void {
  const missing = needs.filter((n) => !n.present()).map((n) => n.pkg);
  if (missing.length === 0) return;
  if (!isRoot()) {
    console.error(
      `Halfmark ${why} needs these Debian packages, which are missing: ${missing.join(', ')}.\n` +
        `Install them with:  sudo apt-get install -y ${missing.join(' ')}` +
        (missing.includes('postgresql') ? '\nor set DATABASE_URL to a PostgreSQL you already run.' : ''),
    );
    process.exit(1);
  }
  console.log(`Installing Debian packages: ${missing.join(', ')} …`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const update = spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  if (update.status !== 0) console.warn('apt-get update failed; trying the install anyway.');
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...missing], { stdio: 'inherit', env });
  const still = needs.filter((n) => !n.present()).map((n) => n.pkg);
  if (still.length) {
    console.error(`These packages are still missing after apt-get: ${still.join(', ')}`);
    process.exit(1);
  }
}
