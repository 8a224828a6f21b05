/** Starting and stopping a Halfmark server child process (bench and kill test). */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

/** A server child process and its URL. */
export interface ServerChild {
  child: ChildProcess;
  url: string;
  pid: number;
}

/**
 * Starts scripts/lib/bench-server.ts in a child node process with the given environment and
 * waits for its "LISTENING" line (or fails after `timeoutMs`).
 */
export function startServerChild(env: Record<string, string>, timeoutMs = 60_000): Promise<ServerChild> {
  // BENCH_CPU_PROF=<dir> writes a V8 CPU profile of the server there when it stops.
  const profile = process.env.BENCH_CPU_PROF ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_CPU_PROF}`] : [];
  const child = spawn(process.execPath, [...profile, '--import', 'tsx', path.join(root, 'scripts/lib/bench-server.ts')], {
    cwd: root,
    env: { ...process.env, LOG_LEVEL: 'silent', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  return new Promise((resolve, reject) => {
    let out = '';
    let err = '';
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`server did not start in ${timeoutMs} ms: ${err}`));
    }, timeoutMs);
    child.stderr?.on('data', (chunk: Buffer) => {
      err += chunk.toString();
    });
    child.stdout?.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const match = /LISTENING (\S+)/.exec(out);
      if (match?.[1] && child.pid !== undefined) {
        clearTimeout(timer);
        resolve({ child, url: match[1], pid: child.pid });
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`server exited with ${code} before listening: ${err}`));
    });
  });
}

/** Stops a server child: SIGTERM (or the given signal) and wait for it to exit. */
export function stopServerChild(server: ServerChild, signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
  return new Promise((resolve) => {
    if (server.child.exitCode !== null || server.child.signalCode !== null) return resolve();
    server.child.once('exit', () => resolve());
    server.child.kill(signal);
  });
}
