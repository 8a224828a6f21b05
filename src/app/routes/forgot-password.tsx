import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { ResetRequestSchema } from '../../../shared/schemas/auth';
import { Wordmark } from '../../components/ui/wordmark';
import { paths } from '../../config/paths';
import { useRequestReset } from '../../features/auth/api/account';
import { Field } from '../../features/auth/components/field';

/** Asks for a reset link by e-mail; the answer is the same whether the address is known or not. */
export function ForgotPasswordRoute() {
  const reset = useRequestReset();
  const form = useForm<z.input<typeof ResetRequestSchema>, unknown, z.output<typeof ResetRequestSchema>>({ resolver: zodResolver(ResetRequestSchema), defaultValues: { email: '' } });
  const onSubmit = form.handleSubmit((body) => reset.mutateAsync(body).catch(() => undefined));
  return (
    <div className="flex min-h-dvh flex-col items-center bg-ink-900 px-4 py-10 md:justify-center">
      <Wordmark className="h-9 w-auto" />
      <section className="mt-8 w-full max-w-sm rounded-card bg-white p-6 shadow-lg">
        <h1 className="mb-4 text-title text-ink-900">Reset your password</h1>
        {reset.isSuccess ? (
          <p role="status" className="text-body">{reset.data.message}</p>
        ) : (
          <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Reset password">
            <Field label="E-mail" type="email" autoComplete="username" error={form.formState.errors.email} {...form.register('email')} />
            {reset.error ? <p role="alert" className="text-stop-700">▲ {reset.error.message}</p> : null}
            <button type="submit" disabled={form.formState.isSubmitting} className="h-12 rounded-md bg-ink-900 font-semibold text-white">Send me a link</button>
          </form>
        )}
        <p className="mt-5 text-center"><Link to={paths.signIn.path} className="font-semibold text-temper-700 underline">Back to sign-in</Link></p>
      </section>
    </div>
  );
}
