import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { loadReviewCases } from '@/lib/db/review';
import { parseCaseFilter, periodLabel } from '@/lib/review';
import { LEVEL_LABEL } from '@/lib/domain/ruleLabel';
import { QUEUE_REASON_LABEL, REVIEW_STATUS_LABEL } from '@/lib/domain/review';
import { REGIMEN_LABEL } from '@/lib/domain/regimen';
import { PROCEDURE_LABEL } from '@/lib/domain/caseFacts';
import { TopBar } from '../../../top-bar';
import { flatParams, reviewContext } from '../../_shared/review-context';
import { ReviewNav } from '../_ui/review-nav';
import { CsvLink } from '../_ui/csv-link';
import { dur } from '../_ui/format';
import '../review.css';

export const dynamic = 'force-dynamic';

/** The cases behind a number of the review (drill-down): each links to its evidence. */
export default async function ReviewCasesPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireAccess('/review/cases');
  const params = flatParams(await searchParams);
  const ctx = await reviewContext(user, params, false);
  const filter = parseCaseFilter(params);
  const { rows, description, reviews, reasons } = await loadReviewCases(db(), ctx.unit, { period: ctx.period, filter });
  const back = `/review?${new URLSearchParams(ctx.period.month ? { month: ctx.period.month } : { from: ctx.period.from, to: ctx.period.to })}`;
  return (
    <>
      <TopBar user={user} />
      <main className="review">
        <ReviewNav active="cases" period={ctx.period} />
        <section className="panel">
          <div className="section-head">
            <h1 data-testid="cases-title">{description}</h1>
            <CsvLink table="cases" period={ctx.period} extra={{ figure: filter.figure, dim: filter.dim, value: filter.value, queue: filter.queue ? '1' : undefined }} />
          </div>
          <p className="muted">
            {periodLabel(ctx.period)} · {rows.length} case{rows.length === 1 ? '' : 's'} · <Link href={back}>back to the review</Link>
          </p>
          {ctx.periodProblem && <p className="error" role="alert">{ctx.periodProblem}</p>}
          {rows.length === 0 ? (
            <p className="muted" data-testid="no-cases">No case matches.</p>
          ) : (
            <div className="table-scroll">
              <table data-testid="case-list">
                <thead>
                  <tr><th>Case</th><th>Date</th><th>Room</th><th>Procedure</th><th>Regimen</th><th>ASA</th><th>Proceduralist</th><th>Nurse</th><th>Level</th><th className="num">Episodes</th><th>First apnea response</th><th>Queue</th><th>Review</th></tr>
                </thead>
                <tbody>
                  {rows.map((r) => {
                    const rv = reviews.get(r.caseId);
                    const why = reasons.get(r.caseId) ?? [];
                    return (
                      <tr key={r.caseId} data-testid="review-case-row">
                        <td><Link href={`/review/cases/${encodeURIComponent(r.caseId)}`} data-testid="review-case-link">{r.key ?? r.caseId}</Link></td>
                        <td>{r.date}</td>
                        <td>{r.room ?? '—'}</td>
                        <td>{PROCEDURE_LABEL[r.procedureType] ?? r.procedureType}</td>
                        <td>{REGIMEN_LABEL[r.regimen]}</td>
                        <td>{r.asaClass ?? '—'}{r.asaEmergency ? 'E' : ''}</td>
                        <td>{r.proceduralist ?? '—'}</td>
                        <td>{r.nurse ?? '—'}</td>
                        <td>{r.summary ? <span className={`level level-${r.summary.caseLevel}`}>{LEVEL_LABEL[r.summary.caseLevel]}</span> : '—'}{r.summary?.majorPhysiology ? <span className="reason">major</span> : null}</td>
                        <td className="num">{r.summary?.episodeCount ?? '—'}</td>
                        <td>{dur(r.summary?.firstApneaResponseS)}</td>
                        <td>{why.map((w) => <span key={w} className="reason">{QUEUE_REASON_LABEL[w]}</span>)}</td>
                        <td>{rv ? <span className={`review-status ${rv.status}`}>{REVIEW_STATUS_LABEL[rv.status]}</span> : why.length ? <span className="review-status to_review">{REVIEW_STATUS_LABEL.to_review}</span> : ''}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          )}
        </section>
      </main>
    </>
  );
}
