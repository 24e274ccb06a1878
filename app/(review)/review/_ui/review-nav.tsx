import Link from 'next/link';
import type { ReviewPeriod } from '@/lib/review';
import { qs } from './format';

const TABS = [
  { href: '/review', label: 'Monthly review', id: 'overview' },
  { href: '/review/queue', label: 'Review queue', id: 'queue' },
  { href: '/review/rule-sets', label: 'Rule sets', id: 'rule-sets' },
] as const;

/** The review's own tabs, keeping the period. */
export function ReviewNav({ active, period }: { active: (typeof TABS)[number]['id'] | 'cases'; period: ReviewPeriod }) {
  const q = period.month ? qs({ month: period.month }) : qs({ from: period.from, to: period.to });
  return (
    <nav className="review-nav" aria-label="Review">
      {TABS.map((t) => (
        <Link key={t.id} href={`${t.href}${q}`} className={t.id === active ? 'active' : undefined} aria-current={t.id === active ? 'page' : undefined}>
          {t.label}
        </Link>
      ))}
    </nav>
  );
}
