import Link from 'next/link';
import type { IssuedSummary } from '@/lib/db/indicatorReports';
import { formatPeriod } from '@/lib/indicators';

/** A table of issued report versions; `current` marks the one on screen. */
export function IssuedList({ reports, empty, current }: { reports: IssuedSummary[]; empty: string; current?: string }) {
  if (reports.length === 0) return <p className="muted">{empty}</p>;
  return (
    <table data-testid="issued-list">
      <thead>
        <tr>
          <th>Period</th>
          <th>Scope</th>
          <th>Version</th>
          <th>Issued</th>
          <th>By</th>
          <th>Changes from the version before</th>
          <th>Catalogue · rule set</th>
        </tr>
      </thead>
      <tbody>
        {reports.map((r) => (
          <tr key={r.id} className={r.id === current ? 'current-version' : undefined}>
            <td>{formatPeriod(r.period)}</td>
            <td>{r.scopeLabel}</td>
            <td>
              <Link href={`/reports/issued/${r.id}`}>version {r.version}</Link>
              {r.id === current ? ' (shown)' : ''}
            </td>
            <td>{r.issuedOn}</td>
            <td>{r.issuedBy}</td>
            <td>{r.changes === null ? 'first version' : `${r.changes} published change${r.changes === 1 ? '' : 's'}`}</td>
            <td>
              v{r.catalogueVersion} · {r.ruleSet.id} v{r.ruleSet.version}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
