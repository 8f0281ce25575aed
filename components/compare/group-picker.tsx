import type { GroupOption } from '@/db/queries/comparisons';

function GroupSelect({ name, label, options, value }: { name: string; label: string; options: GroupOption[]; value: string | null }) {
  return (
    <label className="block min-w-56 flex-1 text-sm">
      <span className="mb-1 block text-muted">{label}</span>
      <select name={name} defaultValue={value ?? ''} className="w-full rounded-md border border-line bg-canvas px-3 py-2 text-ink focus:border-beam" data-testid={`group-${name}`}>
        <option value="" disabled>
          Pick a revision or variant
        </option>
        {options.map((o) => (
          <option key={o.key} value={o.key}>
            {o.label} · {o.captures} capture{o.captures === 1 ? '' : 's'}
          </option>
        ))}
      </select>
    </label>
  );
}

/** A plain GET form: the choice lands in the URL, so a comparison can be bookmarked and shared. */
export function GroupPicker({ action, options, a, b }: { action: string; options: GroupOption[]; a: string | null; b: string | null }) {
  return (
    <form method="get" action={action} className="flex flex-wrap items-end gap-3">
      <GroupSelect name="a" label="A — baseline" options={options} value={a} />
      <GroupSelect name="b" label="B — compared with A" options={options} value={b} />
      <button type="submit" className="rounded-md bg-beam px-3 py-2 text-sm font-semibold text-canvas hover:bg-beam/85">
        Compare
      </button>
    </form>
  );
}
