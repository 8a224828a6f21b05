import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type SortingState } from '@tanstack/react-table';
import { useMemo } from 'react';
import { ROLES, ROLE_LABELS, type Role } from '../../../../shared/permissions';
import type { Page, UserView } from '../../../../shared/schemas/users';
import { useUpdateUser, useUserAction } from '../api/mutations';

function Status({ user }: { user: UserView }) {
  // Word and shape together: never colour alone.
  if (!user.active) return <span className="text-ink-500">◇ deactivated</span>;
  if (user.locked) return <span className="font-semibold text-stop-700">▲ locked</span>;
  if (user.invited) return <span className="text-warn-700">○ invited</span>;
  return <span className="text-good-700">■ active</span>;
}

/**
 * The people list: sorting and paging happen on the server; the table only draws the page and
 * reports which column the user asked to sort by.
 */
export function UsersTable(props: {
  data: Page<UserView> | undefined;
  sort: string;
  onSort: (sort: string) => void;
  canWrite: boolean;
  meId: number | undefined;
}) {
  const update = useUpdateUser();
  const action = useUserAction();
  const sorting: SortingState = [{ id: props.sort.replace(/^-/, ''), desc: props.sort.startsWith('-') }];
  const columns = useMemo<ColumnDef<UserView>[]>(
    () => [
      { id: 'name', accessorKey: 'name', header: 'Name', cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
      { id: 'email', accessorKey: 'email', header: 'E-mail' },
      {
        id: 'role',
        accessorKey: 'role',
        header: 'Role',
        cell: (c) =>
          props.canWrite && c.row.original.id !== props.meId ? (
            <select
              aria-label={`Role of ${c.row.original.name}`}
              className="rounded-md border border-ink-300 px-2 py-1"
              value={c.row.original.role}
              onChange={(e) => update.mutate({ id: c.row.original.id, role: e.target.value as Role })}
            >
              {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
            </select>
          ) : (
            ROLE_LABELS[c.row.original.role]
          ),
      },
      { id: 'badgeCode', header: 'Badge', enableSorting: false, cell: (c) => <span className="font-mono">{c.row.original.badgeCode ?? '—'}</span> },
      { id: 'status', header: 'Status', enableSorting: false, cell: (c) => <Status user={c.row.original} /> },
      {
        id: 'actions',
        header: '',
        enableSorting: false,
        cell: (c) => {
          const u = c.row.original;
          if (!props.canWrite || u.id === props.meId) return null;
          return (
            <div className="flex flex-wrap gap-2">
              {u.locked ? <button type="button" className="rounded-md px-2 py-1 font-semibold ring-1 ring-ink-300" onClick={() => action.mutate({ id: u.id, action: 'unlock' })}>Unlock</button> : null}
              {u.invited && u.active ? <button type="button" className="rounded-md px-2 py-1 font-semibold ring-1 ring-ink-300" onClick={() => action.mutate({ id: u.id, action: 'invite' })}>Resend invite</button> : null}
              <button type="button" className="rounded-md px-2 py-1 font-semibold ring-1 ring-ink-300" onClick={() => update.mutate({ id: u.id, active: !u.active })}>
                {u.active ? 'Deactivate' : 'Reactivate'}
              </button>
            </div>
          );
        },
      },
    ],
    [props.canWrite, props.meId, update, action],
  );
  const table = useReactTable({
    data: props.data?.items ?? [],
    columns,
    state: { sorting },
    manualSorting: true,
    manualPagination: true,
    rowCount: props.data?.total ?? 0,
    getCoreRowModel: getCoreRowModel(),
    onSortingChange: (updater) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const s = next[0];
      props.onSort(s ? `${s.desc ? '-' : ''}${s.id}` : 'name');
    },
  });
  const error = update.error ?? action.error;
  return (
    <div className="overflow-x-auto rounded-card bg-white ring-1 ring-ink-100">
      {error ? <p role="alert" className="px-4 py-2 text-stop-700">▲ {error.message}</p> : null}
      <table className="w-full text-left text-body">
        <thead className="bg-ink-50 text-caption uppercase tracking-wide text-ink-600">
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => {
                const dir = h.column.getIsSorted();
                return (
                  <th key={h.id} className="px-4 py-2" aria-sort={dir === 'asc' ? 'ascending' : dir === 'desc' ? 'descending' : undefined}>
                    {h.column.getCanSort() ? (
                      <button type="button" className="font-semibold uppercase" onClick={h.column.getToggleSortingHandler()}>
                        {flexRender(h.column.columnDef.header, h.getContext())} {dir === 'asc' ? '▲' : dir === 'desc' ? '▼' : ''}
                      </button>
                    ) : (
                      flexRender(h.column.columnDef.header, h.getContext())
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id} className="border-t border-ink-100">
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className="px-4 py-2 align-middle">{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
              ))}
            </tr>
          ))}
          {props.data && props.data.items.length === 0 ? (
            <tr><td colSpan={columns.length} className="px-4 py-6 text-center text-ink-500">Nobody matches.</td></tr>
          ) : null}
        </tbody>
      </table>
    </div>
  );
}
