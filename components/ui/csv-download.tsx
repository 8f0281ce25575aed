'use client';

function csvEscape(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Saves a table as `name.csv` in the browser: a header line, then one line per row (CRLF, UTF-8). */
export function downloadCsv(name: string, header: readonly string[], rows: readonly (readonly string[])[]): void {
  const lines = [header.map(csvEscape).join(','), ...rows.map((r) => r.map(csvEscape).join(','))];
  const blob = new Blob([lines.join('\r\n') + '\r\n'], { type: 'text/csv;charset=utf-8' });
  const a = document.createElement('a');
  a.href = URL.createObjectURL(blob);
  a.download = `${name}.csv`;
  a.click();
  URL.revokeObjectURL(a.href);
}

/** The "Export CSV" link-button above a table, right-aligned. */
export function ExportCsvBar({ onExport }: { onExport: () => void }) {
  return (
    <div className="mb-2 flex justify-end">
      <button type="button" onClick={onExport} className="text-xs text-muted underline-offset-2 hover:text-beam hover:underline">
        Export CSV
      </button>
    </div>
  );
}
