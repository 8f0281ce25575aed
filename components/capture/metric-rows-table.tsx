export type MetricRow = { key: string; label: string; value: string; unit: string; definition: string };

/**
 * A reading's figures as rows: name, value, unit and a one-line definition. On a narrow screen the
 * table scrolls inside its own box instead of widening the page.
 */
export function MetricRowsTable({ rows, testId }: { rows: readonly MetricRow[]; testId: string }) {
  return (
    <div className="overflow-x-auto" data-table-scroll>
      <table className="w-full text-sm" data-testid={testId}>
        <tbody>
          {rows.map((m) => (
            <tr key={m.key} className="border-t border-line align-top" data-metric={m.key}>
              <th scope="row" className="py-1.5 pr-3 text-left font-medium text-ink">
                {m.label}
              </th>
              <td className="whitespace-nowrap py-1.5 pr-2 text-right font-mono tabular-nums text-ink">{m.value}</td>
              <td className="whitespace-nowrap py-1.5 pr-3 text-xs text-muted">{m.unit}</td>
              <td className="py-1.5 text-xs text-muted">{m.definition}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
