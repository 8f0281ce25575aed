'use client';

import clsx from 'clsx';
import Link from 'next/link';
import { usePathname } from 'next/navigation';

export function SettingsTabs({ tabs }: { tabs: { href: string; label: string }[] }) {
  const path = usePathname();
  return (
    <nav aria-label="Lab settings" className="mb-6 flex gap-1 border-b border-line">
      {tabs.map((t) => {
        const active = path === t.href;
        return (
          <Link key={t.href} href={t.href} aria-current={active ? 'page' : undefined} className={clsx('-mb-px border-b-2 px-3 py-2 text-sm', active ? 'border-beam text-ink' : 'border-transparent text-muted hover:text-ink')}>
            {t.label}
          </Link>
        );
      })}
    </nav>
  );
}
