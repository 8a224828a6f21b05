import type { ColumnDef } from '@tanstack/react-table';
import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Mono } from './detail-list';

/** What a linked column shows and where it leads. */
export interface LinkColumn<T> {
  /** The column id; for a sortable column, the server's sort key. */
  id: string;
  header: string;
  sortable?: boolean;
  /** The row's own record (bold, in the accent colour) rather than a related one. */
  primary?: boolean;
  /** Set the text in the code face (codes, numbers); names stay in the text face. */
  mono?: boolean;
  href: (row: T) => string;
  text: (row: T) => ReactNode;
}

/** A list column whose cell links to a record's page: the row's own, or one it belongs to. */
export function linkColumn<T>(column: LinkColumn<T>): ColumnDef<T> {
  const className = column.primary ? 'font-semibold text-temper-700 underline-offset-2 hover:underline' : 'hover:underline';
  return {
    id: column.id,
    header: column.header,
    enableSorting: column.sortable ?? false,
    cell: ({ row }) => (
      <Link to={column.href(row.original)} className={className}>
        {column.mono === false ? column.text(row.original) : <Mono>{column.text(row.original)}</Mono>}
      </Link>
    ),
  };
}
