import { useState } from 'react';
import type { OrderResultsView } from '../../../../shared/schemas/reports';
import { SIGNATURE_MEANINGS } from '../../../../shared/schemas/auth';
import { useIssueReport } from '../api/issue-report';

/**
 * The order's reports, and issuing a new one: the signer reads the meaning of the signature,
 * enters the password again, and (for a replacement) says why.
 */
export function IssueReportPanel({ view }: { view: OrderResultsView }) {
  const [password, setPassword] = useState('');
  const [reason, setReason] = useState('');
  const issue = useIssueReport(view.order.id);
  const replacing = view.reports.length > 0;
  return (
    <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby="report-heading">
      <h2 id="report-heading" className="text-lead font-semibold text-ink-900">
        Test report
      </h2>
      {view.reports.length > 0 ? (
        <ul className="mt-2 space-y-1 text-body" data-testid="reports-issued">
          {view.reports.map((r) => (
            <li key={r.number}>
              <a className="font-mono underline" href={r.href} target="_blank" rel="noreferrer">
                {r.number}
              </a>{' '}
              issued {new Date(r.issuedAt).toLocaleString('en-GB')} by {r.issuedBy}
              {r.supersedes ? ` (replaces ${r.supersedes})` : ''}
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-1 text-body text-ink-500">No report issued yet.</p>
      )}
      {view.blockers.map((b) => (
        <p key={b} className="mt-2 text-body text-warn-700">
          ⚠ {b}
        </p>
      ))}
      {view.canIssue ? (
        <form
          className="mt-3 space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            issue.mutate({ password, reason: replacing ? reason : undefined }, { onSuccess: () => setPassword('') });
          }}
        >
          <p className="rounded-md bg-ink-50 p-3 text-body">
            Signing means: <strong>{SIGNATURE_MEANINGS.report}</strong> The issue date is the date retention rules count from.
          </p>
          {replacing ? (
            <label className="block text-caption font-semibold text-ink-700">
              Why this report replaces the last one
              <input className="h-10 w-full rounded-md border border-ink-300 px-3 text-body" value={reason} onChange={(e) => setReason(e.target.value)} />
            </label>
          ) : null}
          <label className="block text-caption font-semibold text-ink-700">
            Your password, to sign
            <input type="password" autoComplete="current-password" className="h-10 w-full rounded-md border border-ink-300 px-3 text-body" value={password} onChange={(e) => setPassword(e.target.value)} />
          </label>
          {issue.error ? <p className="rounded-md bg-stop-100 p-3 text-body text-stop-700" role="alert">⚠ {issue.error.message}</p> : null}
          {issue.data ? (
            <p className="rounded-md bg-good-100 p-3 text-body text-good-700" role="status">
              ✓ Report <span className="font-mono">{issue.data.report.number}</span> issued and signed.
            </p>
          ) : null}
          <button type="submit" className="h-12 rounded-md bg-ink-900 px-5 text-lead font-semibold text-white disabled:bg-ink-400" disabled={issue.isPending || password === ''}>
            {issue.isPending ? 'Signing…' : 'Sign and issue report'}
          </button>
        </form>
      ) : null}
    </section>
  );
}
