/** A small closed-loop load generator: N clients, each sending its next request when the last one answers. */
import http from 'node:http';

/** What one load phase measured. */
export interface PhaseResult {
  name: string;
  clients: number;
  requests: number;
  events: number;
  errors: number;
  seconds: number;
  eventsPerSecond: number;
  p50Ms: number;
  p99Ms: number;
}

/** The value at quantile q (0..1) of a list of latencies. */
export function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return 0;
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? 0;
}

/** Turns latencies and counts into a phase result. */
export function summarise(name: string, clients: number, latencies: number[], events: number, errors: number, seconds: number): PhaseResult {
  const sorted = [...latencies].sort((a, b) => a - b);
  return {
    name,
    clients,
    requests: latencies.length,
    events,
    errors,
    seconds,
    eventsPerSecond: events / seconds,
    p50Ms: quantile(sorted, 0.5),
    p99Ms: quantile(sorted, 0.99),
  };
}

/**
 * Runs `clients` loops for `seconds` against an HTTP server, each posting the body that `next()`
 * makes; counts `eventsPer` events per successful request (a batch carries many).
 */
export async function runHttpPhase(opts: {
  name: string;
  url: string;
  path: string;
  headers: Record<string, string>;
  clients: number;
  seconds: number;
  next: () => unknown;
  eventsPer: number;
}): Promise<PhaseResult> {
  const target = new URL(opts.path, opts.url);
  const agent = new http.Agent({ keepAlive: true, maxSockets: opts.clients });
  const latencies: number[] = [];
  let errors = 0;
  const deadline = performance.now() + opts.seconds * 1000;
  const send = (body: string) =>
    new Promise<number>((resolve, reject) => {
      const req = http.request(
        target,
        { method: 'POST', agent, headers: { ...opts.headers, 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) } },
        (res) => {
          res.resume();
          res.on('end', () => resolve(res.statusCode ?? 0));
        },
      );
      req.on('error', reject);
      req.end(body);
    });
  const started = performance.now();
  await Promise.all(
    Array.from({ length: opts.clients }, async () => {
      while (performance.now() < deadline) {
        const body = JSON.stringify(opts.next());
        const t0 = performance.now();
        const status = await send(body).catch(() => 0);
        latencies.push(performance.now() - t0);
        if (status !== 200 && status !== 201) errors++;
      }
    }),
  );
  const seconds = (performance.now() - started) / 1000;
  agent.destroy();
  return summarise(opts.name, opts.clients, latencies, (latencies.length - errors) * opts.eventsPer, errors, seconds);
}
