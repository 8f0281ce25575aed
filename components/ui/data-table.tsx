'use client';

import clsx from 'clsx';
import Link from 'next/link';
import { useMemo, useState } from 'react';
import { downloadCsv, ExportCsvBar } from './csv-download';
import { ariaSortOf, SortButton } from './sort-header';

export type Column = { key: string; label: string; numeric?: boolean };
/**
 * A cell carries what to show and what to sort by, as plain data (server → client). `node`, when
 * given, is shown in place of the text (a badge, a note); the text still goes into the CSV.
 */
export type Cell = { text: string; sort?: number | string | null; node?: React.ReactNode };
export type Row = { id: string; href?: string; cells: Record<string, Cell> };

/** A table that sorts on any column and exports what it shows as CSV. */
export function DataTable({ columns, rows, csvName, empty, testId }: { columns: Column[]; rows: Row[]; csvName: string; empty?: React.ReactNode; testId?: string }) {
  const [sortKey, setSortKey] = useState<string | null>(null);
  const [desc, setDesc] = useState(false);

  const sorted = useMemo(() => {
    if (!sortKey) return rows;
    const key = sortKey;
    const val = (r: Row) => r.cells[key]?.sort ?? r.cells[key]?.text ?? null;
    return [...rows].sort((a, b) => {
      const va = val(a);
      const vb = val(b);
      if (va === vb) return 0;
      if (va === null) return 1;
      if (vb === null) return -1;
      const cmp = typeof va === 'number' && typeof vb === 'number' ? va - vb : String(va).localeCompare(String(vb), undefined, { numeric: true });
      return desc ? -cmp : cmp;
    });
  }, [rows, sortKey, desc]);

  function exportCsv() {
    downloadCsv(
      csvName,
      columns.map((c) => c.label),
      sorted.map((r) => columns.map((c) => r.cells[c.key]?.text ?? '')),
    );
  }

  if (rows.length === 0 && empty) return <>{empty}</>;

  return (
    <div>
      <ExportCsvBar onExport={exportCsv} />
      {/* a table wider than its panel scrolls inside it, never the page */}
      <div className="overflow-x-auto rounded-md border border-line" data-table-scroll>
        <table className="w-full text-sm" data-testid={testId}>
          {/* headings in their own case: uppercase turns η into a capital eta that reads as H, and widens every column */}
          <thead className="bg-raised text-left text-xs text-muted">
            <tr>
              {columns.map((c) => {
                const active = sortKey === c.key;
                return (
                  <th key={c.key} scope="col" className={clsx('px-1.5 py-2 align-bottom font-medium first:pl-3 last:pr-3', c.numeric && 'text-right')} aria-sort={ariaSortOf(active, desc)}>
                    <SortButton
                      label={c.label}
                      active={active}
                      desc={desc}
                      onClick={() => {
                        if (active) setDesc(!desc);
                        else {
                          setSortKey(c.key);
                          setDesc(false);
                        }
                      }}
                    />
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody>
            {sorted.map((r) => (
              <tr key={r.id} className="border-t border-line hover:bg-raised/60">
                {columns.map((c, i) => {
                  const cell = r.cells[c.key];
                  const text = cell?.node ?? (c.numeric ? <NumericText text={cell?.text ?? ''} /> : (cell?.text ?? ''));
                  return (
                    <td key={c.key} className={clsx('px-1.5 py-2 align-top first:pl-3 last:pr-3', c.numeric ? 'text-right font-mono tabular-nums' : 'min-w-[5rem] break-words')}>
                      {i === 0 && r.href ? (
                        <Link href={r.href} className="font-medium text-ink hover:text-beam">
                          {text}
                        </Link>
                      ) : (
                        text
                      )}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

/**
 * A figure stays on one line; a note after it in brackets ("48 % ± 2 % (estimated backgrounds)",
 * "5 (on, off, ambient)") goes on the next, so a wide note does not widen the column.
 */
function NumericText({ text }: { text: string }) {
  const m = /^(.*?\S)\s+(\(.+\))$/.exec(text);
  if (!m) return <span className="whitespace-nowrap">{text}</span>;
  return (
    <>
      <span className="whitespace-nowrap">{m[1]}</span> <span className="block font-sans text-xs text-muted">{m[2]}</span>
    </>
  );
}
