import Link from 'next/link';
import { periodLabel, shiftMonth, type ReviewPeriod } from '@/lib/review';
import { qs } from './format';

/**
 * Month or date-range picker as a plain GET form (works without JavaScript). `keep` carries
 * other query parameters (e.g. the focus figure) across.
 */
export function PeriodPicker({ action, period, keep = {}, problem }: { action: string; period: ReviewPeriod; keep?: Record<string, string | undefined>; problem?: string | null }) {
  const month = period.month ?? period.from.slice(0, 7);
  const hidden = Object.entries(keep).filter(([, v]) => v);
  return (
    <section className="panel period" aria-label="Period">
      <div className="period-head">
        <h2 data-testid="period-label">{periodLabel(period)}</h2>
        <div className="row">
          <Link className="button" href={`${action}${qs({ month: shiftMonth(month, -1), ...keep })}`} data-testid="prev-month">← {shiftMonth(month, -1)}</Link>
          <Link className="button" href={`${action}${qs({ month: shiftMonth(month, 1), ...keep })}`} data-testid="next-month">{shiftMonth(month, 1)} →</Link>
        </div>
      </div>
      <div className="period-forms">
        <form method="get" action={action} className="row">
          {hidden.map(([k, v]) => <input key={k} type="hidden" name={k} value={v} />)}
          <label className="inline">Month <input type="month" name="month" defaultValue={period.month ?? ''} required /></label>
          <button type="submit">Show month</button>
        </form>
        <form method="get" action={action} className="row">
          {hidden.map(([k, v]) => <input key={k} type="hidden" name={k} value={v} />)}
          <label className="inline">From <input type="date" name="from" defaultValue={period.from} required /></label>
          <label className="inline">to <input type="date" name="to" defaultValue={period.to} required /></label>
          <button type="submit">Show range</button>
        </form>
      </div>
      {problem && <p className="error" role="alert">The period asked for was not valid ({problem}); showing the last full month instead.</p>}
    </section>
  );
}
