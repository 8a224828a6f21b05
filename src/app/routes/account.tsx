import { ROLE_LABELS } from '../../../shared/permissions';
import { PageHeader } from '../../components/ui/page-header';
import { useMe } from '../../features/auth/api/queries';
import { ChangePasswordForm, PinForm } from '../../features/auth/components/account-forms';

/** One's own account: who I am, my badge, password and station PIN. */
export function AccountRoute() {
  const me = useMe();
  if (!me.data) return null;
  const { user } = me.data;
  return (
    <>
      <PageHeader title="Account" subtitle={`${user.name} · ${ROLE_LABELS[user.role]} · ${user.email}`} />
      <p className="mb-5 text-body">Badge <span className="font-mono font-semibold">{user.badgeCode ?? 'none yet'}</span></p>
      <div className="grid gap-5 md:grid-cols-2">
        <section className="rounded-card bg-white p-5 ring-1 ring-ink-100">
          <h2 className="mb-3 text-lead font-semibold">Password</h2>
          <ChangePasswordForm />
        </section>
        <section className="rounded-card bg-white p-5 ring-1 ring-ink-100">
          <h2 className="mb-3 text-lead font-semibold">Station PIN</h2>
          <PinForm hasPin={user.hasPin} />
        </section>
      </div>
    </>
  );
}
