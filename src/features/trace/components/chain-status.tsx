import type { TraceView } from '../../../../shared/schemas/trace';

/** A verdict by word and shape: a filled circle for intact, a triangle for a break. */
export function Verdict({ ok, children, testId }: { ok: boolean; children: React.ReactNode; testId?: string }) {
  return (
    <p
      className={`flex items-start gap-2 rounded-md px-3 py-2 text-body font-semibold ring-1 ring-inset ${ok ? 'bg-good-100 text-good-700 ring-good-500' : 'bg-stop-100 text-stop-700 ring-stop-500'}`}
      data-ok={ok}
      data-testid={testId}
    >
      <svg width="14" height="14" viewBox="0 0 14 14" aria-hidden className="mt-1 shrink-0">
        {ok ? <circle cx="7" cy="7" r="6" fill="currentColor" /> : <path d="M7 1 13.5 12.5H0.5Z" fill="currentColor" />}
      </svg>
      <span>{children}</span>
    </p>
  );
}

/** Each chain's verification, the files' check, and when it was done. */
export function ChainStatus({ trace }: { trace: TraceView }) {
  const broken = trace.chains.filter((c) => !c.ok);
  const badFiles = trace.files.checks.filter((c) => !c.ok);
  return (
    <div className="flex flex-col gap-2">
      <Verdict ok={trace.chainOk} testId="chain-verdict">
        {trace.chainOk ? `Chain intact: ${trace.chains.length} of ${trace.chains.length} verified` : `Chain broken on ${broken.map((c) => c.item).join(', ')}`}
      </Verdict>
      {broken.map((c) => (
        <p key={c.item} className="pl-6 text-body text-stop-700">
          {c.firstBreak?.message}
        </p>
      ))}
      {trace.files.checks.length > 0 ? (
        <Verdict ok={trace.files.ok} testId="files-verdict">
          {trace.files.ok
            ? trace.files.mode === 'rehash'
              ? `Files re-hashed: ${trace.files.checks.length} match`
              : `Files present: ${trace.files.checks.length}`
            : `Files: ${badFiles.length} do not check out`}
        </Verdict>
      ) : null}
      {badFiles.map((c) => (
        <p key={c.sha256} className="pl-6 text-body text-stop-700">
          {c.message}
        </p>
      ))}
      <ul className="flex flex-col gap-1 text-caption text-ink-600">
        {trace.chains.map((c) => (
          <li key={c.item} className="flex flex-wrap gap-x-2">
            <span className="font-mono font-semibold text-ink-800">{c.item}</span>
            <span>
              {c.role === 'self' ? 'this item' : c.role} · {c.events} events · head seq {c.headSeq}
            </span>
            <span className="font-mono text-ink-500" title={c.headHash ?? ''}>
              {c.headHash?.slice(0, 16)}…
            </span>
          </li>
        ))}
      </ul>
      <p className="text-caption text-ink-500">Verified {new Date(trace.verifiedAt).toLocaleString()}.</p>
    </div>
  );
}
