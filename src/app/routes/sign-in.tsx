import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { Wordmark } from '../../components/ui/wordmark';
import { paths } from '../../config/paths';
import { SignInForm } from '../../features/auth/components/sign-in-form';
import { safeNext } from '../../features/auth/session-guard';

export { redirectIfSignedIn as loader } from '../../features/auth/session-guard';

/** The sign-in screen: e-mail and password, then back to where the user was going. */
export function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const next = safeNext(params.get('next'));
  return (
    <div className="flex min-h-dvh flex-col items-center bg-ink-900 px-4 py-10 md:justify-center">
      <Wordmark className="h-9 w-auto" />
      <section className="mt-8 w-full max-w-sm rounded-card bg-white p-6 shadow-lg">
        <h1 className="mb-1 text-title text-ink-900">Sign in</h1>
        <p className="mb-5 text-body text-ink-500">Use the e-mail address your lab manager invited.</p>
        <SignInForm onSignedIn={() => navigate(next, { replace: true })} />
        <p className="mt-5 text-center text-body">
          <Link to={paths.forgotPassword.path} className="font-semibold text-temper-700 underline">
            Forgot your password?
          </Link>
        </p>
      </section>
    </div>
  );
}
