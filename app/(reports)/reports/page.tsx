import { requireAccess } from '@/lib/server/access';
import { allows } from '@/lib/server/policy';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { localDate } from '@/lib/_shared/time';
import { computeReport, configuredMinCell, listIssuedReports, listUnits, ReportConflictError, ReportInputError } from '@/lib/db/indicatorReports';
import { formatPeriod, lastCompletePeriod, parsePeriod, periodContaining, periodsEndingWith, reportKey, ScopeParam, type IndicatorReport, type Period } from '@/lib/indicators';
import { TopBar } from '../../top-bar';
import { IssueButton } from './issue-button';
import { IssuedList } from './issued-list';
import { ReportView } from './report-view';
import './reports.css';

export const dynamic = 'force-dynamic';

type Search = Record<string, string | string[] | undefined>;

function periodOptions(today: string): { group: string; periods: Period[] }[] {
  const newestFirst = (kind: Period['kind'], n: number) => periodsEndingWith(periodContaining(kind, today), n).reverse();
  return [
    { group: 'Quarters', periods: newestFirst('quarter', 12) },
    { group: 'Months', periods: newestFirst('month', 24) },
    { group: 'Years', periods: newestFirst('year', 5) },
  ];
}

export default async function ReportsPage({ searchParams }: { searchParams: Promise<Search> }) {
  const user = await requireAccess('/reports');
  const sp = await searchParams;
  const client = db();
  const t = now();
  const units = await listUnits(client);
  const today = localDate(t, units[0]?.timeZone ?? 'UTC');
  const floor = configuredMinCell();
  const asked = typeof sp.period === 'string' ? parsePeriod(sp.period) : null;
  const period = asked ?? lastCompletePeriod('quarter', today);
  const scopeParsed = ScopeParam.safeParse(sp.scope);
  const scope = scopeParsed.success ? scopeParsed.data : 'all';
  const minCellAsked = typeof sp.minCell === 'string' && /^\d+$/.test(sp.minCell) ? Number(sp.minCell) : undefined;

  let report: IndicatorReport | null = null;
  let error: string | null = null;
  if (units.length > 0) {
    try {
      report = await computeReport(client, { period: period.label, scope, minCell: minCellAsked }, t, floor);
    } catch (e) {
      if (e instanceof ReportInputError || e instanceof ReportConflictError) error = e.message;
      else throw e;
    }
  }
  const issued = await listIssuedReports(client);
  const key = report ? reportKey(report.period, report.scope.unitIds) : null;
  const mayIssue = allows('POST /api/v1/reports', user.role);
  const mayExport = allows('GET /api/v1/reports/export', user.role);
  const chosen = new Set(scope === 'all' ? units.map((u) => u.id) : scope);
  const qs = report ? new URLSearchParams({ period: report.period.label, scope: scope === 'all' ? 'all' : report.scope.unitIds.join(','), minCell: String(report.minCell) }) : null;
  const ended = report ? report.period.end < today : false;

  return (
    <>
      <TopBar user={user} />
      <main>
        <h1>
          Safety indicators
          {report && <span className="draft-badge">draft — not issued</span>}
        </h1>
        <form method="get" className="panel report-picker" aria-label="Choose the report">
          <div>
            <label htmlFor="period">Period</label>
            <select id="period" name="period" defaultValue={period.label}>
              {periodOptions(today).map((g) => (
                <optgroup key={g.group} label={g.group}>
                  {g.periods.map((p) => (
                    <option key={p.label} value={p.label}>
                      {formatPeriod(p)}
                      {p.end >= today ? ' (in progress)' : ''}
                    </option>
                  ))}
                </optgroup>
              ))}
            </select>
          </div>
          <fieldset>
            <legend>Scope (none ticked = all units)</legend>
            {units.map((u) => (
              <label key={u.id} className="chip">
                <input type="checkbox" name="scope" value={u.id} defaultChecked={chosen.has(u.id)} /> {u.name}
              </label>
            ))}
          </fieldset>
          <div>
            <label htmlFor="minCell">Smallest published count (≥ {floor})</label>
            <input id="minCell" name="minCell" type="number" min={floor} max={1000} step={1} defaultValue={report?.minCell ?? floor} />
          </div>
          <div className="actions">
            <button type="submit">Show report</button>
          </div>
        </form>
        {error && (
          <p className="error" role="alert">
            {error}
          </p>
        )}
        {units.length === 0 && <p className="muted">No unit is set up yet.</p>}
        {report && qs && (
          <>
            <div className="report-actions">
              {mayIssue && (ended ? <IssueButton period={report.period.label} scope={scope === 'all' ? 'all' : report.scope.unitIds} minCell={report.minCell} /> : <p className="muted">{report.period.label} has not ended yet; it can be issued once it is over.</p>)}
              {mayExport && (
                <div className="downloads">
                  <span className="muted">Draft downloads:</span>
                  <a href={`/api/v1/reports/export?${qs}&format=pdf`}>PDF</a>
                  <a href={`/api/v1/reports/export?${qs}&format=csv`}>CSV</a>
                  <a href={`/api/v1/reports/export?${qs}&format=json`}>JSON</a>
                </div>
              )}
            </div>
            <section className="panel">
              <h2>Issued versions of this report</h2>
              <IssuedList reports={issued.filter((r) => r.reportKey === key)} empty="Not issued yet." />
            </section>
            <div style={{ marginTop: 12 }}>
              <ReportView report={report} />
            </div>
          </>
        )}
        <section className="panel" style={{ marginTop: 12 }}>
          <h2>All issued reports</h2>
          <IssuedList reports={issued} empty="No report has been issued yet." />
        </section>
      </main>
    </>
  );
}
