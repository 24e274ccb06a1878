import { qs } from './format';
import type { ReviewPeriod } from '@/lib/review';

/** A link that downloads one table as CSV from /api/v1/review/export. */
export function CsvLink({ table, period, extra = {}, label = 'CSV' }: { table: string; period: Pick<ReviewPeriod, 'from' | 'to'>; extra?: Record<string, string | undefined>; label?: string }) {
  return (
    <a className="button small-button" href={`/api/v1/review/export${qs({ table, from: period.from, to: period.to, ...extra })}`} download data-testid={`csv-${table}`}>
      {label}
    </a>
  );
}
