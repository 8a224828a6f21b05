import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { z } from 'zod';
import { NewPasswordSchema } from '../../../shared/schemas/auth';
import { Wordmark } from '../../components/ui/wordmark';
import { paths } from '../../config/paths';
import { fetchLinkInfo, useSetPassword } from '../../features/auth/api/account';
import { Field } from '../../features/auth/components/field';

const FormSchema = z.object({ password: NewPasswordSchema });

/** Where invitation and reset links land: choose a password, then go to the floor signed in. */
export function SetPasswordRoute() {
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const navigate = useNavigate();
  const info = useQuery({ queryKey: ['auth', 'link', token], queryFn: () => fetchLinkInfo(token), retry: false, staleTime: Infinity });
  const setPassword = useSetPassword();
  const form = useForm<z.infer<typeof FormSchema>>({ resolver: zodResolver(FormSchema), defaultValues: { password: '' } });
  const onSubmit = form.handleSubmit(async ({ password }) => {
    try {
      await setPassword.mutateAsync({ token, password });
      navigate(paths.home.path, { replace: true });
    } catch {
      // The message shows below the form.
    }
  });
  return (
    <div className="flex min-h-dvh flex-col items-center bg-ink-900 px-4 py-10 md:justify-center">
      <Wordmark className="h-9 w-auto" />
      <section className="mt-8 w-full max-w-sm rounded-card bg-white p-6 shadow-lg">
        <h1 className="mb-2 text-title text-ink-900">{info.data?.purpose === 'invite' ? 'Welcome to Halfmark' : 'Choose a new password'}</h1>
        {info.isPending ? <p>Checking the link …</p> : null}
        {info.error ? (
          <p role="alert" className="text-stop-700">▲ {info.error.message}</p>
        ) : info.data ? (
          <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Set password">
            <p className="text-body text-ink-600">For {info.data.name} ({info.data.email}).</p>
            <Field label="New password (12 characters or more)" type="password" autoComplete="new-password" error={form.formState.errors.password} {...form.register('password')} />
            {setPassword.error ? <p role="alert" className="text-stop-700">▲ {setPassword.error.message}</p> : null}
            <button type="submit" disabled={form.formState.isSubmitting} className="h-12 rounded-md bg-ink-900 font-semibold text-white">Set password and sign in</button>
          </form>
        ) : null}
        <p className="mt-5 text-center"><Link to={paths.signIn.path} className="font-semibold text-temper-700 underline">Back to sign-in</Link></p>
      </section>
    </div>
  );
}
