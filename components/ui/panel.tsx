import clsx from 'clsx';

export function Panel({ title, actions, children, className }: { title?: React.ReactNode; actions?: React.ReactNode; children: React.ReactNode; className?: string }) {
  return (
    // min-w-0: in a grid or flex layout a wide table scrolls inside the panel instead of widening the page
    <section className={clsx('min-w-0 rounded-lg border border-line bg-panel', className)}>
      {title || actions ? (
        <header className="flex items-center justify-between gap-3 border-b border-line px-4 py-2.5">
          <h2 className="text-sm font-semibold tracking-wide text-ink">{title}</h2>
          <div className="flex items-center gap-2">{actions}</div>
        </header>
      ) : null}
      <div className="p-4">{children}</div>
    </section>
  );
}

export function PageTitle({ kicker, title, children }: { kicker?: React.ReactNode; title: React.ReactNode; children?: React.ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div>
        {kicker ? <div className="mb-1 text-xs uppercase tracking-[0.18em] text-muted">{kicker}</div> : null}
        <h1 className="text-2xl font-semibold text-ink">{title}</h1>
      </div>
      <div className="flex items-center gap-2">{children}</div>
    </div>
  );
}

export function EmptyState({ title, children }: { title: string; children?: React.ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-line px-6 py-10 text-center">
      <p className="font-medium text-ink">{title}</p>
      {children ? <div className="mt-2 text-sm text-muted">{children}</div> : null}
    </div>
  );
}

export function Notice({ tone = 'warn', children }: { tone?: 'warn' | 'fail' | 'info'; children: React.ReactNode }) {
  const cls = tone === 'fail' ? 'border-fail/50 bg-fail/10 text-fail' : tone === 'info' ? 'border-beam/40 bg-beam/10 text-ink' : 'border-warn/50 bg-warn/10 text-ink';
  return <div className={clsx('rounded-md border px-3 py-2 text-sm', cls)}>{children}</div>;
}
