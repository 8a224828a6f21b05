import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';

const SOURCES = ['src', 'shared', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'package.json', 'public'];

function newestMtime(p: string): number {
  if (!existsSync(p)) return 0;
  const st = statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  return readdirSync(p).reduce((max, name) => Math.max(max, newestMtime(path.join(p, name))), st.mtimeMs);
}

/** Builds the client with Vite when dist/ is missing or older than any of its sources. */
export function buildClientIfStale(root: string): void {
  const built = path.join(root, 'dist', 'index.html');
  const builtAt = existsSync(built) ? statSync(built).mtimeMs : 0;
  const sourcesAt = Math.max(...SOURCES.map((s) => newestMtime(path.join(root, s))));
  if (builtAt >= sourcesAt) return;
  console.log(builtAt ? 'The client changed since its last build; rebuilding …' : 'Building the client …');
  const r = spawnSync(path.join(root, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn'], {
    cwd: root,
    stdio: 'inherit',
  });
  if (r.status !== 0) throw new Error('The client build failed; see the messages above.');
}
