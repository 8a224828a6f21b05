import type { TraceEvent } from '../../../../shared/schemas/trace';

function when(iso: string): string {
  return new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'medium' });
}

/** A payload as short "name: value" lines, nested members with dotted names. */
function payloadLines(payload: Record<string, unknown>, prefix = ''): string[] {
  return Object.entries(payload).flatMap(([key, value]) => {
    const name = prefix ? `${prefix}.${key}` : key;
    if (Array.isArray(value) && value.every((v) => typeof v !== 'object' || v === null)) return [`${name}: ${value.join(', ')}`];
    if (typeof value === 'object' && value !== null && !Array.isArray(value)) return payloadLines(value as Record<string, unknown>, name);
    return [`${name}: ${typeof value === 'string' ? value : JSON.stringify(value)}`];
  });
}

/** Every event in the order the server recorded it: what, who, where, when (device and server), payload, signature, hash. */
export function Timeline({ events, self }: { events: readonly TraceEvent[]; self: string }) {
  return (
    <ol className="relative flex flex-col gap-4 border-l-2 border-ink-200 pl-5" data-testid="timeline">
      {events.map((e) => {
        const lines = payloadLines(e.payload);
        return (
          <li key={e.hash} className="relative" data-type={e.type} data-item={e.item}>
            <span aria-hidden className={`absolute -left-[27px] top-1.5 h-3 w-3 rounded-full ring-2 ring-white ${e.cancelled ? 'bg-stop-500' : e.item === self ? 'bg-ink-900' : 'bg-ink-400'}`} />
            <div className="flex flex-wrap items-baseline gap-x-2">
              <span className={`text-body font-semibold ${e.cancelled ? 'text-ink-500 line-through' : 'text-ink-900'}`}>{e.type.replace(/_/g, ' ')}</span>
              {e.cancelled ? <span className="text-caption font-semibold text-stop-700">▲ voided by a later event</span> : null}
              <span className="font-mono text-caption text-ink-500">
                {e.item} · seq {e.seq}
              </span>
            </div>
            <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-caption text-ink-700">
              <dt className="text-ink-500">Who</dt>
              <dd>
                {e.actor.name}
                {e.actor.role ? ` (${e.actor.role})` : ''}
              </dd>
              <dt className="text-ink-500">Where</dt>
              <dd>{[e.station ? `${e.stationName ?? e.station} (${e.station})` : null, e.container ? `in ${e.container}` : null].filter(Boolean).join(', ') || '—'}</dd>
              <dt className="text-ink-500">Device time</dt>
              <dd>{when(e.occurredAt)}</dd>
              <dt className="text-ink-500">Server time</dt>
              <dd>{when(e.recordedAt)}</dd>
              {e.signature ? (
                <>
                  <dt className="text-ink-500">Signed</dt>
                  <dd>
                    {e.signature.signerName}, {when(e.signature.signedAt)}: “{e.signature.meaning}”
                  </dd>
                </>
              ) : null}
              {lines.length ? (
                <>
                  <dt className="text-ink-500">Payload</dt>
                  <dd className="font-mono break-all">
                    {lines.map((l) => (
                      <span key={l} className="block">
                        {l}
                      </span>
                    ))}
                  </dd>
                </>
              ) : null}
              <dt className="text-ink-500">Hash</dt>
              <dd className="font-mono break-all text-ink-500" title={e.hash}>
                {e.hash.slice(0, 24)}…
              </dd>
            </dl>
          </li>
        );
      })}
    </ol>
  );
}
