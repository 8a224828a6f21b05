import type { ReactNode } from 'react';

/** A record's facts as label/value pairs, two columns on wide screens. */
export function DetailList({ items }: { items: readonly { label: string; value: ReactNode }[] }) {
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-3 sm:grid-cols-2 lg:grid-cols-3">
      {items.map((item) => (
        <div key={item.label} className="min-w-0">
          <dt className="text-caption font-semibold uppercase tracking-wide text-ink-500">{item.label}</dt>
          <dd className="mt-0.5 break-words text-body text-ink-900">{item.value ?? <span className="text-ink-400">—</span>}</dd>
        </div>
      ))}
    </dl>
  );
}

/** A white card with an optional title line and actions. */
export function Panel({ title, actions, children, className = '' }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-card bg-white p-4 shadow-sm ring-1 ring-ink-100 md:p-5 ${className}`}>
      {title || actions ? (
        <div className="mb-4 flex flex-wrap items-center justify-between gap-2">
          {title ? <h2 className="text-lead font-semibold text-ink-900">{title}</h2> : <span />}
          {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
        </div>
      ) : null}
      {children}
    </section>
  );
}

/** A code (specimen, sample, heat number) in the monospace face. */
export function Mono({ children }: { children: ReactNode }) {
  return <span className="font-mono text-[0.95em] tracking-tight">{children}</span>;
}
