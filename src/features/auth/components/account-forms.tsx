import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, type FieldValues, type Path, type UseFormReturn } from 'react-hook-form';
import { ChangePasswordSchema, SetPinSchema, type ChangePasswordBody, type SetPinBody } from '../../../../shared/schemas/users';
import { ApiError } from '../../../lib/api-client';
import { useChangePassword, useSetPin } from '../api/account';
import { Field } from './field';

function showServerErrors<T extends FieldValues>(form: UseFormReturn<T>, err: unknown): void {
  if (err instanceof ApiError) for (const i of err.fieldIssues()) form.setError(i.path as Path<T>, { message: i.message });
}

/** Current password and a new one (12 characters or more); other sessions end. */
export function ChangePasswordForm() {
  const change = useChangePassword();
  const form = useForm<ChangePasswordBody>({ resolver: zodResolver(ChangePasswordSchema), defaultValues: { currentPassword: '', newPassword: '' } });
  const onSubmit = form.handleSubmit(async (body) => {
    try {
      await change.mutateAsync(body);
      form.reset();
    } catch (err) {
      showServerErrors(form, err);
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Change password" className="flex flex-col gap-3">
      <Field label="Current password" type="password" autoComplete="current-password" error={form.formState.errors.currentPassword} {...form.register('currentPassword')} />
      <Field label="New password (12 characters or more)" type="password" autoComplete="new-password" error={form.formState.errors.newPassword} {...form.register('newPassword')} />
      {change.isSuccess ? <p role="status" className="text-good-700">■ Password changed. Other devices are signed out.</p> : null}
      <button type="submit" disabled={form.formState.isSubmitting} className="h-12 rounded-md bg-ink-900 font-semibold text-white disabled:opacity-60">Change password</button>
    </form>
  );
}

/** A 4–8 digit PIN for switching operator at a shared station; the password confirms it. */
export function PinForm({ hasPin }: { hasPin: boolean }) {
  const setPin = useSetPin();
  const form = useForm<SetPinBody>({ resolver: zodResolver(SetPinSchema), defaultValues: { password: '', pin: '' } });
  const onSubmit = form.handleSubmit(async (body) => {
    try {
      await setPin.mutateAsync(body);
      form.reset();
    } catch (err) {
      showServerErrors(form, err);
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Station PIN" className="flex flex-col gap-3">
      <p className="text-body text-ink-600">{hasPin ? 'You have a PIN. Set a new one to replace it.' : 'You have no PIN yet.'}</p>
      <Field label="PIN (4 to 8 digits)" type="password" inputMode="numeric" autoComplete="off" error={form.formState.errors.pin} {...form.register('pin')} />
      <Field label="Your password" type="password" autoComplete="current-password" error={form.formState.errors.password} {...form.register('password')} />
      {setPin.isSuccess ? <p role="status" className="text-good-700">■ PIN saved.</p> : null}
      <button type="submit" disabled={form.formState.isSubmitting} className="h-12 rounded-md bg-ink-900 font-semibold text-white disabled:opacity-60">Save PIN</button>
    </form>
  );
}
