'use client';

import clsx from 'clsx';
import Link from 'next/link';
import { usePathname } from 'next/navigation';

const LINKS = [
  { href: '/projects', label: 'Projects' },
  { href: '/patterns', label: 'Test patterns' },
  { href: '/settings', label: 'Lab settings' },
];

export function NavLinks() {
  const path = usePathname();
  return (
    <nav aria-label="Main" className="flex gap-1 lg:flex-col">
      {LINKS.map((l) => {
        const active = path === l.href || path.startsWith(`${l.href}/`);
        return (
          <Link
            key={l.href}
            href={l.href}
            aria-current={active ? 'page' : undefined}
            className={clsx('rounded-md px-3 py-2 text-sm', active ? 'bg-beam/15 text-beam' : 'text-muted hover:bg-raised hover:text-ink')}
          >
            {l.label}
          </Link>
        );
      })}
    </nav>
  );
}
