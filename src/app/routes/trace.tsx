import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useParams } from 'react-router-dom';
import { parseCode } from '../../../shared/domain/codes';
import { buttonClass, Button } from '../../components/ui/button';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { StateBadge } from '../../components/ui/state-badge';
import { useCan } from '../../features/auth/api/queries';
import { SearchBox } from '../../features/search/components/search-box';
import { auditPackHref, traceQueries } from '../../features/trace/api/queries';
import { AnomalyList } from '../../features/trace/components/anomaly-list';
import { AttachmentUpload } from '../../features/trace/components/attachment-upload';
import { Attachments } from '../../features/trace/components/attachments';
import { ChainStatus } from '../../features/trace/components/chain-status';
import { Genealogy } from '../../features/trace/components/genealogy';
import { Timeline } from '../../features/trace/components/timeline';

function TraceOf({ code }: { code: string }) {
  const [files, setFiles] = useState<'presence' | 'rehash'>('presence');
  const trace = useQuery(traceQueries.detail(code, files));
  const canAttach = useCan('events.record');
  if (trace.isPending) return <p className="text-body text-ink-500">Tracing {code} …</p>;
  if (trace.isError) {
    return (
      <p className="rounded-md bg-stop-100 p-3 text-body font-semibold text-stop-700" role="alert">
        ▲ {trace.error.message}
      </p>
    );
  }
  const t = trace.data;
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title={t.item.code}
        subtitle={
          <span className="inline-flex flex-wrap items-center gap-2">
            <span className="capitalize">{t.item.kind}</span>
            <StateBadge state={t.item.state} />
          </span>
        }
        actions={
          t.canExport ? (
            <>
              <a className={buttonClass('primary')} href={auditPackHref(t.item.code, 'pdf')} target="_blank" rel="noreferrer" data-testid="audit-pdf">
                Audit PDF
              </a>
              <a className={buttonClass('secondary')} href={auditPackHref(t.item.code, 'jsonl')} download>
                Ledger export
              </a>
            </>
          ) : null
        }
      />
      <Panel
        title="Chain of custody"
        actions={
          t.canExport && t.files.checks.length > 0 && files === 'presence' ? (
            <Button variant="secondary" size="sm" onClick={() => setFiles('rehash')} busy={trace.isFetching}>
              Re-hash files
            </Button>
          ) : null
        }
      >
        <ChainStatus trace={t} />
      </Panel>
      <Panel title="Where it comes from">
        <Genealogy trace={t} />
      </Panel>
      <Panel title={`Anomalies (${t.anomalies.length})`}>
        <AnomalyList anomalies={t.anomalies} />
      </Panel>
      <Panel title={`Attachments (${t.attachments.length})`}>
        {canAttach ? <AttachmentUpload itemCode={t.item.code} /> : null}
        <Attachments trace={t} />
      </Panel>
      <Panel title={`Timeline (${t.events.length} events)`}>
        <Timeline events={t.events} self={t.item.code} />
      </Panel>
    </div>
  );
}

/** Trace: scan or type any code and follow it back to its heat and order; or search by heat, order or PO. */
export function TraceRoute() {
  const raw = useParams().code ?? '';
  const parsed = raw ? parseCode(raw) : null;
  return (
    <div className="flex flex-col gap-5">
      {!raw ? <PageHeader title="Trace" subtitle="Follow any specimen, half or container back to its heat and order." /> : null}
      <SearchBox autoFocus={!raw} key={raw} />
      {parsed && !parsed.ok ? (
        <p className="rounded-md bg-stop-100 p-3 text-body font-semibold text-stop-700" role="alert">
          ▲ {parsed.message}
        </p>
      ) : null}
      {parsed?.ok ? <TraceOf code={parsed.code} key={parsed.code} /> : null}
    </div>
  );
}
