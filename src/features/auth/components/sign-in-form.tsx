import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { LoginSchema } from '../../../../shared/schemas/auth';
import { ApiError } from '../../../lib/api-client';
import { useSignIn } from '../api/sign-in';

type LoginInput = z.input<typeof LoginSchema>;
type LoginOutput = z.output<typeof LoginSchema>;

/** E-mail and password; server errors (wrong pair, locked, too many tries) show above the button. */
export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const signIn = useSignIn();
  const form = useForm<LoginInput, unknown, LoginOutput>({ resolver: zodResolver(LoginSchema), defaultValues: { email: '', password: '' } });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    try {
      await signIn.mutateAsync(body);
      onSignedIn();
    } catch (err) {
      if (err instanceof ApiError) {
        for (const issue of err.fieldIssues()) {
          if (issue.path === 'email' || issue.path === 'password') form.setError(issue.path, { message: issue.message });
        }
      }
    }
  });
  const serverError = signIn.error instanceof ApiError && signIn.error.fieldIssues().length === 0 ? signIn.error.message : signIn.error ? 'Signing in failed. Try again.' : null;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      <label className="flex flex-col gap-1">
        <span className="text-body font-semibold text-ink-800">E-mail</span>
        <input
          type="email"
          autoComplete="username"
          autoFocus
          className="h-12 rounded-md border border-ink-300 px-3 text-lead"
          aria-invalid={errors.email ? true : undefined}
          {...form.register('email')}
        />
        {errors.email ? <span className="text-caption text-stop-700">{errors.email.message}</span> : null}
      </label>
      <label className="flex flex-col gap-1">
        <span className="text-body font-semibold text-ink-800">Password</span>
        <input
          type="password"
          autoComplete="current-password"
          className="h-12 rounded-md border border-ink-300 px-3 text-lead"
          aria-invalid={errors.password ? true : undefined}
          {...form.register('password')}
        />
        {errors.password ? <span className="text-caption text-stop-700">{errors.password.message}</span> : null}
      </label>
      {serverError ? (
        <p role="alert" className="rounded-md bg-stop-100 px-3 py-2 text-body text-stop-700">
          <span aria-hidden>▲ </span>
          {serverError}
        </p>
      ) : null}
      <button
        type="submit"
        disabled={form.formState.isSubmitting}
        className="h-12 rounded-md bg-ink-900 text-lead font-semibold text-white disabled:opacity-60"
      >
        {form.formState.isSubmitting ? 'Signing in …' : 'Sign in'}
      </button>
    </form>
  );
}
