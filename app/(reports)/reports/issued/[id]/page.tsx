import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requireAccess } from '@/lib/server/access';
import { allows } from '@/lib/server/policy';
import { db } from '@/lib/db/client';
import { getIssuedReport, ReportNotFoundError, type IssuedReportView } from '@/lib/db/indicatorReports';
import { formatPeriod } from '@/lib/indicators';
import { TopBar } from '../../../../top-bar';
import { IssuedList } from '../../issued-list';
import { ReportView } from '../../report-view';
import { ResolveRefForm } from '../../resolve-ref-form';
import '../../reports.css';

export const dynamic = 'force-dynamic';

export default async function IssuedReportPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireAccess('/reports/issued/[id]');
  const { id } = await params;
  const mayResolve = allows('GET /api/v1/reports/[id]/refs/[ref]', user.role);
  let view: IssuedReportView;
  try {
    view = await getIssuedReport(db(), id, { withRefs: mayResolve });
  } catch (e) {
    if (e instanceof ReportNotFoundError) notFound();
    throw e;
  }
  const { summary, report, diff } = view;
  const mayExport = allows('GET /api/v1/reports/[id]/export', user.role);
  const live = new URLSearchParams({ period: report.period.label, scope: report.scope.unitIds.join(','), minCell: String(report.minCell) });
  return (
    <>
      <TopBar user={user} />
      <main>
        <p className="muted small">
          <Link href={`/reports?${live}`}>← live report for this period and scope</Link>
        </p>
        <h1>
          {formatPeriod(report.period)} · {report.scope.label} · version {summary.version}
          <span className="frozen-badge">issued, frozen</span>
        </h1>
        <p className="muted">
          Issued {summary.issuedOn} by {summary.issuedBy}. These numbers are stored as issued and never change; late documentation appears in a new version.
        </p>
        {mayExport && (
          <div className="report-actions">
            <div className="downloads">
              <span className="muted">Downloads of version {summary.version}:</span>
              <a href={`/api/v1/reports/${summary.id}/export?format=pdf`}>PDF</a>
              <a href={`/api/v1/reports/${summary.id}/export?format=csv`}>CSV</a>
              <a href={`/api/v1/reports/${summary.id}/export?format=json`}>JSON</a>
            </div>
          </div>
        )}
        <section className="panel">
          <h2>Versions</h2>
          <IssuedList reports={view.versions} empty="" current={summary.id} />
        </section>
        <section className="panel" data-testid="diff">
          <h2>{diff ? `Differences from version ${diff.fromVersion}` : 'Differences'}</h2>
          {!diff && <p className="muted">This is the first version.</p>}
          {diff && diff.changes.length === 0 && <p className="muted">No published value changed.</p>}
          {diff && diff.changes.length > 0 && (
            <table className="diff-table">
              <thead>
                <tr>
                  <th>Indicator</th>
                  <th>What</th>
                  <th>Version {diff.fromVersion}</th>
                  <th>Version {diff.toVersion}</th>
                </tr>
              </thead>
              <tbody>
                {diff.changes.map((c, i) => (
                  <tr key={i}>
                    <td>{c.title}</td>
                    <td>{c.what}</td>
                    <td>{c.before}</td>
                    <td>{c.after}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </section>
        {mayResolve && (
          <section className="panel">
            <h2>Resolve a case reference</h2>
            <p className="muted small">Each counted case has an opaque, random reference in this version (listed under each indicator). Opening one is recorded in the audit trail.</p>
            <ResolveRefForm reportId={summary.id} />
          </section>
        )}
        <div style={{ marginTop: 12 }}>
          <ReportView report={report} refs={view.refs} />
        </div>
      </main>
    </>
  );
}
