import { useQuery } from '@tanstack/react-query';
import { PageHeader } from '../../components/ui/page-header';
import { outboxQueries } from '../../features/outbox/api/queries';

/** The development outbox: mail the stand-in SMTP server received instead of delivering it. */
export function OutboxRoute() {
  const list = useQuery(outboxQueries.list());
  return (
    <>
      <PageHeader title="Outbox" subtitle="Development only: mail the local stand-in SMTP server kept. Nothing here left this machine." />
      {list.error ? <p role="alert" className="text-stop-700">▲ {list.error.message}</p> : null}
      {list.data?.items.length === 0 ? <p className="text-ink-500">No mail yet.</p> : null}
      <ul className="flex flex-col gap-3">
        {list.data?.items.map((m) => (
          <li key={m.id} className="rounded-card bg-white p-4 ring-1 ring-ink-100">
            <p className="font-semibold">{m.subject}</p>
            <p className="text-caption text-ink-600">To {m.to.join(', ')} · {new Date(m.receivedAt).toLocaleString()}</p>
            <pre className="mt-2 whitespace-pre-wrap break-words font-mono text-caption text-ink-800">{m.text}</pre>
          </li>
        ))}
      </ul>
    </>
  );
}
