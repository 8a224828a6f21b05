import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { ROLES, ROLE_LABELS, type Role } from '../../../shared/permissions';
import { PageHeader } from '../../components/ui/page-header';
import { useCan, useMe } from '../../features/auth/api/queries';
import { userQueries, type UserFilters } from '../../features/users/api/queries';
import { InviteForm } from '../../features/users/components/invite-form';
import { UsersTable } from '../../features/users/components/users-table';

const PAGE_SIZE = 25;

/** People: search, sort and page through everyone (all in the URL); managers invite and change roles. */
export function UsersRoute() {
  const [params, setParams] = useSearchParams();
  const me = useMe();
  const canWrite = useCan('users.write');
  const [invited, setInvited] = useState<string | null>(null);
  const filters: UserFilters = {
    q: params.get('q') ?? undefined,
    role: (params.get('role') as Role | null) ?? undefined,
    sort: (params.get('sort') as UserFilters['sort']) ?? 'name',
    page: Number(params.get('page') ?? 1),
    pageSize: PAGE_SIZE,
  };
  const list = useQuery(userQueries.list(filters));
  const set = (patch: Record<string, string | undefined>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(patch)) v ? next.set(k, v) : next.delete(k);
    if (!('page' in patch)) next.delete('page');
    setParams(next, { replace: true });
  };
  const total = list.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));
  return (
    <>
      <PageHeader title="People" subtitle={`${total} ${total === 1 ? 'person' : 'people'} with access to this lab`} />
      {canWrite ? (
        <section className="mb-5 rounded-card bg-white p-4 ring-1 ring-ink-100">
          <h2 className="mb-3 text-lead font-semibold">Invite someone</h2>
          <InviteForm onDone={setInvited} />
          {invited ? <p role="status" className="mt-2 text-good-700">■ Invitation sent to {invited}. The link lasts 72 hours.</p> : null}
        </section>
      ) : null}
      <div className="mb-3 flex flex-wrap gap-2">
        <input
          type="search"
          aria-label="Search people"
          placeholder="Search name, e-mail or badge"
          defaultValue={filters.q}
          onChange={(e) => set({ q: e.target.value || undefined })}
          className="h-11 min-w-0 flex-1 rounded-md border border-ink-300 px-3"
        />
        <select aria-label="Role" value={filters.role ?? ''} onChange={(e) => set({ role: e.target.value || undefined })} className="h-11 rounded-md border border-ink-300 px-2">
          <option value="">All roles</option>
          {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
        </select>
      </div>
      {list.error ? <p role="alert" className="text-stop-700">▲ {list.error.message}</p> : null}
      <UsersTable data={list.data} sort={filters.sort ?? 'name'} onSort={(sort) => set({ sort })} canWrite={canWrite} meId={me.data?.user.id} />
      <nav aria-label="Pages" className="mt-3 flex items-center justify-end gap-3">
        <button type="button" disabled={(filters.page ?? 1) <= 1} onClick={() => set({ page: String((filters.page ?? 1) - 1) })} className="rounded-md px-3 py-2 font-semibold ring-1 ring-ink-300 disabled:opacity-40">Previous</button>
        <span className="text-ink-600">Page {filters.page} of {pages}</span>
        <button type="button" disabled={(filters.page ?? 1) >= pages} onClick={() => set({ page: String((filters.page ?? 1) + 1) })} className="rounded-md px-3 py-2 font-semibold ring-1 ring-ink-300 disabled:opacity-40">Next</button>
      </nav>
    </>
  );
}
