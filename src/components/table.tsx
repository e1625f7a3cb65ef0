import type { ReactNode } from 'react';
import { Button } from './button';

/** The frame every data table sits in: a bordered white card that scrolls sideways when narrow. */
export function TableFrame({ caption, children }: { caption: string; children: ReactNode }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
      <table className="w-full border-collapse text-left">
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export const headClasses = 'border-b border-ink-200 bg-ink-50 text-[0.9375rem] text-ink-700';
export const headCellClasses = 'px-4 py-2.5 font-semibold whitespace-nowrap';
export const cellClasses = 'px-4 py-3';

/**
 * A column header that sorts the table when pressed; `aria-sort` tells assistive technology the
 * current order and an arrow shows it (never colour alone).
 */
export function SortHeader({
  label,
  column,
  sort,
  direction,
  onSort,
  align = 'left',
}: {
  label: ReactNode;
  column: string;
  sort: string;
  direction: 'asc' | 'desc';
  onSort: (column: string, direction: 'asc' | 'desc') => void;
  align?: 'left' | 'right';
}) {
  const active = sort === column;
  const next = active && direction === 'asc' ? 'desc' : 'asc';
  return (
    <th
      scope="col"
      aria-sort={active ? (direction === 'asc' ? 'ascending' : 'descending') : 'none'}
      className={`${headCellClasses} ${align === 'right' ? 'text-right' : ''}`}
    >
      <button
        type="button"
        onClick={() => onSort(column, active ? next : 'asc')}
        className={`inline-flex items-center gap-1 rounded font-semibold hover:text-ink-900 ${active ? 'text-ink-900' : ''}`}
      >
        {label}
        <span aria-hidden="true" className="w-3 text-ink-500">
          {active ? (direction === 'asc' ? '▲' : '▼') : '↕'}
        </span>
      </button>
    </th>
  );
}

/** "Rows 26–50 of 312" with previous/next buttons, for server-paged tables. */
export function Pager({
  page,
  pageSize,
  total,
  onPage,
  label,
}: {
  page: number;
  pageSize: number;
  total: number;
  onPage: (page: number) => void;
  label: string;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  return (
    <nav aria-label={label} className="mt-3 flex flex-wrap items-center justify-between gap-3 text-[0.9375rem] text-ink-700">
      <p>
        <span className="tabular">
          {first}–{last}
        </span>{' '}
        of <span className="tabular">{total}</span>
        {pages > 1 && (
          <>
            {' '}
            · page <span className="tabular">{page}</span> of <span className="tabular">{pages}</span>
          </>
        )}
      </p>
      <div className="flex gap-2">
        <Button size="sm" variant="secondary" disabled={page <= 1} onClick={() => onPage(page - 1)}>
          ← Previous
        </Button>
        <Button size="sm" variant="secondary" disabled={page >= pages} onClick={() => onPage(page + 1)}>
          Next →
        </Button>
      </div>
    </nav>
  );
}
