import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { ROLES, ROLE_LABELS } from '../../../../shared/permissions';
import { InviteUserSchema } from '../../../../shared/schemas/users';
import { ApiError } from '../../../lib/api-client';
import { useInviteUser } from '../api/mutations';

type In = z.input<typeof InviteUserSchema>;
type Out = z.output<typeof InviteUserSchema>;

const input = 'h-11 rounded-md border border-ink-300 px-3';

/** E-mail, name and role; the person gets a link to choose a password. */
export function InviteForm({ onDone }: { onDone: (email: string) => void }) {
  const invite = useInviteUser();
  const form = useForm<In, unknown, Out>({ resolver: zodResolver(InviteUserSchema), defaultValues: { email: '', name: '', role: 'technician' } });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    try {
      await invite.mutateAsync(body);
      form.reset();
      onDone(body.email);
    } catch (err) {
      if (err instanceof ApiError) {
        for (const i of err.fieldIssues()) if (i.path === 'email' || i.path === 'name' || i.path === 'role') form.setError(i.path, { message: i.message });
      }
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Invite someone" className="grid gap-3 md:grid-cols-[1fr_1fr_12rem_auto] md:items-start">
      <label className="flex flex-col gap-1">
        <span className="text-caption font-semibold text-ink-700">E-mail</span>
        <input type="email" className={input} {...form.register('email')} />
        {errors.email ? <span className="text-caption text-stop-700">{errors.email.message}</span> : null}
      </label>
      <label className="flex flex-col gap-1">
        <span className="text-caption font-semibold text-ink-700">Name</span>
        <input className={input} {...form.register('name')} />
        {errors.name ? <span className="text-caption text-stop-700">{errors.name.message}</span> : null}
      </label>
      <label className="flex flex-col gap-1">
        <span className="text-caption font-semibold text-ink-700">Role</span>
        <select className={input} {...form.register('role')}>
          {ROLES.map((r) => (
            <option key={r} value={r}>{ROLE_LABELS[r]}</option>
          ))}
        </select>
      </label>
      <button type="submit" disabled={form.formState.isSubmitting} className="h-11 self-end rounded-md bg-ink-900 px-4 font-semibold text-white disabled:opacity-60">
        Send invitation
      </button>
      {invite.error && !(invite.error instanceof ApiError && invite.error.fieldIssues().length) ? (
        <p role="alert" className="text-body text-stop-700 md:col-span-4">▲ {invite.error.message}</p>
      ) : null}
    </form>
  );
}
