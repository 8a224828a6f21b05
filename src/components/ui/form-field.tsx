import { useId, useState, type InputHTMLAttributes, type ReactNode, type Ref, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';
import type { FieldValues, Path, UseFormReturn } from 'react-hook-form';
import { ApiError } from '../../lib/api-client';
import { Button } from './button';

const CONTROL =
  'w-full rounded-md border bg-white px-3 text-body text-ink-900 placeholder:text-ink-400 disabled:bg-ink-50 aria-[invalid=true]:border-stop-500 aria-[invalid=true]:ring-1 aria-[invalid=true]:ring-stop-500';

/**
 * A labelled field: the label, the control, a hint, and the error beside it (from the form's
 * schema or from the server). The control gets the ids that tie them together.
 */
export function Field({
  label,
  hint,
  error,
  className = '',
  children,
}: {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
}) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-body font-semibold text-ink-800">
        {label}
      </label>
      {children({ id, describedBy, invalid: Boolean(error) })}
      {hint ? (
        <p id={hintId} className="text-caption text-ink-500">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-caption font-semibold text-stop-700" data-field-error>
          <span aria-hidden>▲ </span>
          {error}
        </p>
      ) : null}
    </div>
  );
}

type Common = { label: ReactNode; hint?: ReactNode; error?: string; className?: string };

/** A labelled text input; pass react-hook-form's `register(...)` spread as props. */
export function TextField({ label, hint, error, className, ref, ...input }: Common & InputHTMLAttributes<HTMLInputElement> & { ref?: Ref<HTMLInputElement> }) {
  return (
    <Field label={label} hint={hint} error={error} className={className}>
      {({ id, describedBy, invalid }) => (
        <input
          id={id}
          ref={ref}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={`${CONTROL} h-10 ${invalid ? 'border-stop-500' : 'border-ink-300'}`}
          {...input}
        />
      )}
    </Field>
  );
}

/** A labelled select; `options` are value/label pairs, with an optional empty first choice. */
export function SelectField({
  label,
  hint,
  error,
  className,
  options,
  placeholder,
  ref,
  ...select
}: Common &
  SelectHTMLAttributes<HTMLSelectElement> & {
    options: readonly { value: string | number; label: string }[];
    placeholder?: string;
    ref?: Ref<HTMLSelectElement>;
  }) {
  return (
    <Field label={label} hint={hint} error={error} className={className}>
      {({ id, describedBy, invalid }) => (
        <select
          id={id}
          ref={ref}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={`${CONTROL} h-10 ${invalid ? 'border-stop-500' : 'border-ink-300'}`}
          {...select}
        >
          {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      )}
    </Field>
  );
}

/** A labelled multi-line text input. */
export function TextAreaField({ label, hint, error, className, ref, ...area }: Common & TextareaHTMLAttributes<HTMLTextAreaElement> & { ref?: Ref<HTMLTextAreaElement> }) {
  return (
    <Field label={label} hint={hint} error={error} className={className}>
      {({ id, describedBy, invalid }) => (
        <textarea
          id={id}
          ref={ref}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={`${CONTROL} min-h-20 py-2 ${invalid ? 'border-stop-500' : 'border-ink-300'}`}
          {...area}
        />
      )}
    </Field>
  );
}

/** A form-level message: what went wrong when no single field is to blame. */
export function FormAlert({ children }: { children: ReactNode }) {
  if (!children) return null;
  return (
    <p role="alert" className="rounded-md bg-stop-100 px-3 py-2 text-body text-stop-700">
      <span aria-hidden>▲ </span>
      {children}
    </p>
  );
}

/**
 * Puts a server error's field issues beside the fields they name, and returns the message to show
 * above the form for anything no field on this form can carry (or null when every issue found its
 * field). Paths the form does not know ("heat.heatNumber" on a form without it) stay in the message.
 *
 * @param form - The react-hook-form instance.
 * @param error - What the mutation threw.
 * @param fields - The field paths this form shows.
 * @param pathPrefix - Stripped from the server's paths first, when the form's fields sit nested in
 *   the request body (e.g. "heat." for a heat registered inside an order's request).
 */
export function showServerErrors<T extends FieldValues, O>(
  form: UseFormReturn<T, unknown, O>,
  error: unknown,
  fields: readonly Path<T>[],
  pathPrefix = '',
): string | null {
  if (!(error instanceof ApiError)) return 'Something went wrong; try again.';
  const leftOver: string[] = [];
  let placed = 0;
  for (const issue of error.fieldIssues()) {
    const path = pathPrefix && issue.path.startsWith(pathPrefix) ? issue.path.slice(pathPrefix.length) : issue.path;
    const field = fields.find((f) => f === path);
    if (field) {
      form.setError(field, { type: 'server', message: issue.message }, { shouldFocus: placed === 0 });
      placed += 1;
    } else {
      leftOver.push(issue.message);
    }
  }
  if (placed > 0 && leftOver.length === 0) return null;
  return [error.message, ...leftOver].join(' ');
}

/**
 * A form's submit handler for a round trip to the server: clears the last alert, sends the parsed
 * body, and when the server refuses puts its field issues beside the fields (see
 * {@link showServerErrors}) and keeps the rest as the form's alert.
 *
 * @param form - The react-hook-form instance.
 * @param fields - The field paths this form shows.
 * @param send - Does the work with the body the form's schema parsed; throws what the API threw.
 * @param pathPrefix - See {@link showServerErrors}.
 */
export function useServerSubmit<T extends FieldValues, O>(
  form: UseFormReturn<T, unknown, O>,
  fields: readonly Path<T>[],
  send: (body: O) => Promise<void>,
  pathPrefix = '',
): { onSubmit: ReturnType<UseFormReturn<T, unknown, O>['handleSubmit']>; alert: string | null } {
  const [alert, setAlert] = useState<string | null>(null);
  const onSubmit = form.handleSubmit(async (body) => {
    setAlert(null);
    try {
      await send(body);
    } catch (err) {
      setAlert(showServerErrors(form, err, fields, pathPrefix));
    }
  });
  return { onSubmit, alert };
}

/**
 * The end of a form in a grid: its alert, the submit button (busy while saving) and Cancel when
 * the form may be closed.
 *
 * @param span - The grid columns both rows take, matching the form's grid.
 */
export function FormFooter({
  alert,
  busy,
  submitLabel,
  onCancel,
  span = 'sm:col-span-2',
}: {
  alert: string | null;
  busy: boolean;
  submitLabel: ReactNode;
  onCancel?: () => void;
  span?: string;
}) {
  return (
    <>
      <div className={span}>
        <FormAlert>{alert}</FormAlert>
      </div>
      <div className={`flex gap-2 ${span}`}>
        <Button type="submit" busy={busy} busyLabel="Saving …">
          {submitLabel}
        </Button>
        {onCancel ? (
          <Button variant="ghost" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </>
  );
}
