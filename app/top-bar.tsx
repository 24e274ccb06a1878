import Link from 'next/link';
import type { SessionUser } from '@/lib/server/session';
import { ROLE_LABEL } from '@/lib/server/roles';

const LINKS: { href: string; label: string; roles: string[] }[] = [
  { href: '/cases', label: 'Cases today', roles: ['nurse', 'lead', 'admin'] },
  { href: '/review', label: 'Monthly review', roles: ['lead'] },
  { href: '/reports', label: 'Safety indicators', roles: ['safety', 'lead', 'admin'] },
  { href: '/audit', label: 'Audit trail', roles: ['lead', 'admin'] },
  { href: '/admin', label: 'Administration', roles: ['admin'] },
];

export function TopBar({ user }: { user: SessionUser }) {
  return (
    <header className="topbar">
      <Link href="/" className="brand">Plateau</Link>
      <nav aria-label="Main">
        {LINKS.filter((l) => l.roles.includes(user.role)).map((l) => (
          <Link key={l.href} href={l.href}>{l.label}</Link>
        ))}
      </nav>
      <div className="who">
        <span data-testid="who">{user.displayName} · {ROLE_LABEL[user.role]}</span>
        <form action="/sign-out" method="post">
          <button type="submit">Sign out</button>
        </form>
      </div>
    </header>
  );
}
