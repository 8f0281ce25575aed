'use client';

import clsx from 'clsx';

export type SortDirection = 'ascending' | 'descending';

/** The `aria-sort` of a column heading: only the sorted column carries one. */
export function ariaSortOf(active: boolean, desc: boolean): SortDirection | undefined {
  return active ? (desc ? 'descending' : 'ascending') : undefined;
}

/**
 * A column heading that sorts its table. The sorted column shows ▲ (ascending) or ▼ (descending);
 * the others show a faint up-and-down mark only while hovered or focused, so an unsorted table
 * does not look sorted on every column. The mark's room is kept, so headings do not shift.
 */
export function SortButton({ label, active, desc, onClick, title }: { label: React.ReactNode; active: boolean; desc: boolean; onClick: () => void; title?: string }) {
  const direction = ariaSortOf(active, desc);
  return (
    <button type="button" className="group inline-flex items-center gap-1 rounded-sm [text-transform:inherit] hover:text-ink focus-visible:text-ink" onClick={onClick} title={title} data-sort={direction ?? 'none'}>
      {label}
      <svg
        aria-hidden
        viewBox="0 0 8 12"
        width="8"
        height="12"
        data-testid="sort-mark"
        data-mark={direction ?? 'idle'}
        className={clsx('shrink-0', active ? 'text-beam' : 'opacity-0 transition-opacity group-hover:opacity-60 group-focus-visible:opacity-60')}
        fill="currentColor"
      >
        {direction === 'ascending' ? <path d="M4 2 L8 8 L0 8 Z" /> : null}
        {direction === 'descending' ? <path d="M0 4 L8 4 L4 10 Z" /> : null}
        {direction === undefined ? (
          <>
            <path d="M4 0 L7.5 4.5 L0.5 4.5 Z" />
            <path d="M0.5 7.5 L7.5 7.5 L4 12 Z" />
          </>
        ) : null}
      </svg>
    </button>
  );
}
