import type { InputHTMLAttributes } from 'react';
import type { FieldError } from 'react-hook-form';

/** A labelled input with its error below, for the account and password forms. */
export function Field({ label, error, ...input }: InputHTMLAttributes<HTMLInputElement> & { label: string; error?: FieldError }) {
  return (
    <label className="flex flex-col gap-1">
      <span className="text-body font-semibold text-ink-800">{label}</span>
      <input className="h-12 rounded-md border border-ink-300 px-3 text-lead" aria-invalid={error ? true : undefined} {...input} />
      {error ? <span className="text-caption text-stop-700">{error.message}</span> : null}
    </label>
  );
}
