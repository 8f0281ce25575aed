'use client';

import clsx from 'clsx';

/** A column heading that sorts its table: ▲ while ascending (or idle), ▼ while descending. */
export function SortButton({ label, active, desc, onClick, title }: { label: React.ReactNode; active: boolean; desc: boolean; onClick: () => void; title?: string }) {
  return (
    <button type="button" className="inline-flex items-center gap-1 [text-transform:inherit] hover:text-ink" onClick={onClick} title={title}>
      {label}
      <span aria-hidden className={clsx('text-[10px]', active ? 'text-beam' : 'opacity-30')}>
        {active && desc ? '▼' : '▲'}
      </span>
    </button>
  );
}
