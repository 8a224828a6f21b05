import { useQuery, type QueryKey, type UseQueryOptions } from '@tanstack/react-query';
import {
  flexRender,
  getCoreRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
  type Updater,
} from '@tanstack/react-table';
import { useEffect, useId, useMemo, useState, type ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';
import { DEFAULT_PAGE_SIZE, PAGE_SIZES, type Page } from '../../../shared/schemas/intake-common';
import { Button } from './button';

/** A list's state as the URL keeps it: search, sort, page, page size, and named filters. */
export interface ListParams<F extends string = string> {
  q: string;
  sort: string;
  page: number;
  pageSize: number;
  filters: Partial<Record<F, string>>;
}

/**
 * Reads and writes a server-paged list's state in the URL, so a list can be bookmarked, shared and
 * restored with the back button. Changing the search, sort or a filter goes back to page 1.
 *
 * @param defaultSort - The sort when the URL names none (the server's default too).
 * @param filterKeys - The filters this list offers, as URL parameter names.
 */
export function useListParams<F extends string>(defaultSort: string, filterKeys: readonly F[] = []) {
  const [search, setSearch] = useSearchParams();
  const params: ListParams<F> = useMemo(() => {
    const filters: Partial<Record<F, string>> = {};
    for (const key of filterKeys) {
      const v = search.get(key);
      if (v) filters[key] = v;
    }
    const page = Number(search.get('page'));
    const pageSize = Number(search.get('pageSize'));
    return {
      q: search.get('q') ?? '',
      sort: search.get('sort') || defaultSort,
      page: Number.isInteger(page) && page > 0 ? page : 1,
      pageSize: (PAGE_SIZES as readonly number[]).includes(pageSize) ? pageSize : DEFAULT_PAGE_SIZE,
      filters,
    };
    // filterKeys is a constant list per screen, so the URL and the default sort are the only inputs.
  }, [search, defaultSort]);

  const update = (patch: Partial<Omit<ListParams<F>, 'filters'>> & { filters?: Partial<Record<F, string>> }, opts: { replace?: boolean } = {}) => {
    setSearch(
      (prev) => {
        const next = new URLSearchParams(prev);
        const set = (key: string, value: string | number | undefined, fallback?: string | number) => {
          if (value === undefined || value === '' || value === fallback) next.delete(key);
          else next.set(key, String(value));
        };
        const resetsPage = patch.q !== undefined || patch.sort !== undefined || patch.filters !== undefined || patch.pageSize !== undefined;
        if (patch.q !== undefined) set('q', patch.q.trim());
        if (patch.sort !== undefined) set('sort', patch.sort, defaultSort);
        if (patch.pageSize !== undefined) set('pageSize', patch.pageSize, DEFAULT_PAGE_SIZE);
        if (patch.filters) for (const [k, v] of Object.entries(patch.filters)) set(k, v as string | undefined);
        if (patch.page !== undefined) set('page', patch.page, 1);
        else if (resetsPage) next.delete('page');
        return next;
      },
      { replace: opts.replace ?? false },
    );
  };
  return [params, update] as const;
}

/**
 * The query a list route takes, from the list's URL state: only what is set, so equal lists share
 * one cache entry.
 */
export function listQueryOf<F extends string>(params: ListParams<F>): Record<string, string | number> {
  const out: Record<string, string | number> = { sort: params.sort, page: params.page, pageSize: params.pageSize };
  if (params.q) out.q = params.q;
  for (const [k, v] of Object.entries(params.filters)) if (v) out[k] = v as string;
  return out;
}

/** A server-paged list as a screen holds it: its URL state, the setter, and the page being shown. */
export interface ServerList<T, F extends string = string> {
  params: ListParams<F>;
  setParams: ReturnType<typeof useListParams<F>>[1];
  query: { data: Page<T> | undefined; isFetching: boolean; isPlaceholderData: boolean; error: Error | null };
}

/**
 * A server-paged list: its state in the URL ({@link useListParams}) and the query that fetches
 * the page that state names. Hand the result to {@link DataTable} as `list`; the screen reads
 * `list.query.data` for anything else the answer carries (whether the caller may write, counts).
 *
 * @param defaultSort - The sort when the URL names none (the server's default too).
 * @param filterKeys - The filters this list offers, as URL parameter names.
 * @param queryFor - The feature's list query builder, e.g. `customerQueries.list`.
 */
export function useServerList<F extends string, TData, TKey extends QueryKey>(
  defaultSort: string,
  filterKeys: readonly F[],
  queryFor: (query: Record<string, string | number>) => UseQueryOptions<TData, Error, TData, TKey>,
) {
  const [params, setParams] = useListParams(defaultSort, filterKeys);
  const query = useQuery(queryFor(listQueryOf(params)));
  return { params, setParams, query };
}

/** `?a=1&b=2` from a list query, for the API path. */
export function toQueryString(query: Record<string, string | number | undefined>): string {
  const search = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== '') search.set(k, String(v));
  const text = search.toString();
  return text ? `?${text}` : '';
}

function SearchBox({ value, onChange, placeholder }: { value: string; onChange: (q: string) => void; placeholder: string }) {
  const [text, setText] = useState(value);
  const id = useId();
  useEffect(() => setText(value), [value]);
  useEffect(() => {
    if (text.trim() === value.trim()) return undefined;
    // Wait for a pause in typing so each keystroke does not become a request and a history entry.
    const timer = setTimeout(() => onChange(text), 300);
    return () => clearTimeout(timer);
  }, [text, value, onChange]);
  return (
    <div className="min-w-0 flex-1 basis-56">
      <label htmlFor={id} className="sr-only">
        Search
      </label>
      <input
        id={id}
        type="search"
        value={text}
        onChange={(e) => setText(e.target.value)}
        placeholder={placeholder}
        className="h-10 w-full rounded-md border border-ink-300 bg-white px-3 text-body placeholder:text-ink-400"
      />
    </div>
  );
}

function SortMark({ dir }: { dir: false | 'asc' | 'desc' }) {
  if (!dir) return <span aria-hidden className="text-ink-300">↕</span>;
  return <span aria-hidden>{dir === 'asc' ? '▲' : '▼'}</span>;
}

/**
 * A list whose search, sort, filters and paging are done by the server and kept in the URL. The
 * previous page stays on screen (dimmed) while the next one loads. Columns that the server can sort
 * by set `enableSorting: true` and use the server's sort key as their `id`.
 */
export function DataTable<T>({
  label,
  columns,
  list,
  searchPlaceholder = 'Search',
  filters,
  emptyText = 'Nothing matches.',
  rowKey,
}: {
  /** The table's accessible name. */
  label: string;
  columns: ColumnDef<T>[];
  /** The list from {@link useServerList}. */
  list: ServerList<T>;
  searchPlaceholder?: string;
  filters?: ReactNode;
  emptyText?: string;
  rowKey: (row: T) => string | number;
}) {
  const { params, setParams: onParams } = list;
  const { data, isFetching, error } = list.query;
  // The rows shown belong to the previous query until the next page arrives.
  const isStale = list.query.isPlaceholderData;
  const sorting: SortingState = [{ id: params.sort.replace(/^-/, ''), desc: params.sort.startsWith('-') }];
  const rows = data?.items ?? [];
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (row) => String(rowKey(row)),
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    defaultColumn: { enableSorting: false },
    rowCount: data?.total ?? 0,
    state: { sorting, pagination: { pageIndex: params.page - 1, pageSize: params.pageSize } },
    onSortingChange: (updater: Updater<SortingState>) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const first = next[0];
      if (first) onParams({ sort: `${first.desc ? '-' : ''}${first.id}` });
    },
  });
  const total = data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / params.pageSize));
  const from = total === 0 ? 0 : (params.page - 1) * params.pageSize + 1;
  const to = Math.min(total, params.page * params.pageSize);

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-2">
        <SearchBox value={params.q} onChange={(q) => onParams({ q }, { replace: true })} placeholder={searchPlaceholder} />
        {filters}
      </div>
      <div className="relative overflow-hidden rounded-card bg-white shadow-sm ring-1 ring-ink-100">
        <div className={`absolute inset-x-0 top-0 h-0.5 ${isFetching ? 'animate-pulse bg-temper-400' : 'bg-transparent'}`} aria-hidden />
        <div className="overflow-x-auto">
          <table className={`w-full min-w-[36rem] border-collapse text-left text-body ${isStale ? 'opacity-60' : ''}`} aria-label={label} aria-busy={isFetching || undefined}>
            <thead className="bg-ink-50 text-caption uppercase tracking-wide text-ink-600">
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id}>
                  {group.headers.map((header) => {
                    const sorted = header.column.getIsSorted();
                    return (
                      <th
                        key={header.id}
                        scope="col"
                        className="px-3 py-2 font-semibold"
                        aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      >
                        {header.column.getCanSort() ? (
                          <button
                            type="button"
                            onClick={header.column.getToggleSortingHandler()}
                            className="inline-flex items-center gap-1 uppercase hover:text-ink-900"
                          >
                            {flexRender(header.column.columnDef.header, header.getContext())}
                            <SortMark dir={sorted} />
                          </button>
                        ) : (
                          flexRender(header.column.columnDef.header, header.getContext())
                        )}
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody>
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id} className="border-t border-ink-100 hover:bg-ink-50">
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className="px-3 py-2 align-top">
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {error && !data ? (
          <p role="alert" className="px-3 py-6 text-center text-stop-700">
            <span aria-hidden>▲ </span>
            {error.message}
          </p>
        ) : !data ? (
          <p className="px-3 py-6 text-center text-ink-500">Loading …</p>
        ) : rows.length === 0 ? (
          <p className="px-3 py-6 text-center text-ink-500">{emptyText}</p>
        ) : null}
      </div>
      <nav aria-label={`${label} pages`} className="flex flex-wrap items-center justify-between gap-2 text-body text-ink-600">
        <span data-testid="table-range">
          {total === 0 ? 'No rows' : `${from}–${to} of ${total}`}
        </span>
        <div className="flex items-center gap-2">
          <label className="flex items-center gap-1 text-caption">
            Rows
            <select
              value={params.pageSize}
              onChange={(e) => onParams({ pageSize: Number(e.target.value) })}
              className="h-8 rounded-md border border-ink-300 bg-white px-1"
            >
              {PAGE_SIZES.map((n) => (
                <option key={n} value={n}>
                  {n}
                </option>
              ))}
            </select>
          </label>
          <Button variant="secondary" size="sm" disabled={params.page <= 1} onClick={() => onParams({ page: params.page - 1 })}>
            ‹ Previous
          </Button>
          <span className="text-caption">
            Page {params.page} of {pages}
          </span>
          <Button variant="secondary" size="sm" disabled={params.page >= pages} onClick={() => onParams({ page: params.page + 1 })}>
            Next ›
          </Button>
        </div>
      </nav>
    </div>
  );
}

/** A compact select for a list's filter, kept in the URL by the caller. */
export function FilterSelect({
  label,
  value,
  onChange,
  options,
  allLabel = 'All',
}: {
  label: string;
  value: string | undefined;
  onChange: (value: string | undefined) => void;
  options: readonly { value: string; label: string }[];
  allLabel?: string;
}) {
  const id = useId();
  return (
    <div className="flex flex-col gap-0.5">
      <label htmlFor={id} className="text-caption font-semibold text-ink-600">
        {label}
      </label>
      <select
        id={id}
        value={value ?? ''}
        onChange={(e) => onChange(e.target.value || undefined)}
        className="h-10 rounded-md border border-ink-300 bg-white px-2 text-body"
      >
        <option value="">{allLabel}</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}
