import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { loadReviewQueue } from '@/lib/db/review';
import { LEVEL_LABEL } from '@/lib/domain/ruleLabel';
import { QUEUE_REASON_LABEL, REVIEW_CATEGORY_LABEL, REVIEW_STATUS_LABEL, REVIEW_STATUSES, type ReviewStatus } from '@/lib/domain/review';
import { PROCEDURE_LABEL } from '@/lib/domain/caseFacts';
import { periodLabel } from '@/lib/review';
import { TopBar } from '../../../top-bar';
import { flatParams, reviewContext } from '../../_shared/review-context';
import { ReviewNav } from '../_ui/review-nav';
import { PeriodPicker } from '../_ui/period-picker';
import { CsvLink } from '../_ui/csv-link';
import { dur } from '../_ui/format';
import '../review.css';

export const dynamic = 'force-dynamic';

/** The review queue: cases at level supported or above, with major physiology, or with a slow first response to apnea. */
export default async function ReviewQueuePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireAccess('/review/queue');
  const params = flatParams(await searchParams);
  const ctx = await reviewContext(user, params, false);
  const status = (REVIEW_STATUSES as readonly string[]).includes(params.status ?? '') ? (params.status as ReviewStatus) : undefined;
  const all = await loadReviewQueue(db(), ctx.unit, { period: ctx.period });
  const items = status ? all.filter((i) => (i.review?.status ?? 'to_review') === status) : all;
  const open = all.filter((i) => i.review?.status !== 'reviewed').length;
  const periodKeep: Record<string, string | undefined> = ctx.period.month ? { month: ctx.period.month } : { from: ctx.period.from, to: ctx.period.to };
  return (
    <>
      <TopBar user={user} />
      <main className="review">
        <div className="review-head">
          <h1>Review queue · {ctx.unit.name}</h1>
          <p className="muted">
            A case enters the queue at level “breathing supported” or “rescue”, with major physiology (prolonged apnea, prolonged or critical hypoxemia), or when the first response to its first apnea came more than {ctx.unit.reviewResponseLimitS} s after the apnea began (the unit&apos;s limit).
          </p>
        </div>
        <ReviewNav active="queue" period={ctx.period} />
        <PeriodPicker action="/review/queue" period={ctx.period} keep={{ status }} problem={ctx.periodProblem} />
        <section className="panel">
          <div className="section-head">
            <h2>{periodLabel(ctx.period)}: {all.length} in the queue, {open} to review</h2>
            <div className="row">
              <form method="get" action="/review/queue" className="row">
                {Object.entries(periodKeep).map(([k, v]) => (v ? <input key={k} type="hidden" name={k} value={v} /> : null))}
                <label className="inline">Show
                  <select name="status" defaultValue={status ?? ''}>
                    <option value="">all</option>
                    {REVIEW_STATUSES.map((s) => <option key={s} value={s}>{REVIEW_STATUS_LABEL[s]}</option>)}
                  </select>
                </label>
                <button type="submit">Filter</button>
              </form>
              <CsvLink table="queue" period={ctx.period} />
            </div>
          </div>
          {items.length === 0 ? (
            <p className="muted" data-testid="queue-empty">No case in the queue{status ? ` with status “${REVIEW_STATUS_LABEL[status]}”` : ''}.</p>
          ) : (
            <div className="table-scroll">
              <table data-testid="queue">
                <thead>
                  <tr><th>Case</th><th>Date</th><th>Procedure</th><th>Why</th><th>Level</th><th>First apnea response</th><th>Status</th><th>Category</th><th>Reviewer</th><th /></tr>
                </thead>
                <tbody>
                  {items.map((i) => {
                    const st = i.review?.status ?? 'to_review';
                    return (
                      <tr key={i.row.caseId} data-testid="queue-row" data-status={st}>
                        <td><Link href={`/review/cases/${encodeURIComponent(i.row.caseId)}`}>{i.row.key ?? i.row.caseId}</Link></td>
                        <td>{i.row.date}</td>
                        <td>{PROCEDURE_LABEL[i.row.procedureType] ?? i.row.procedureType}</td>
                        <td>{i.reasons.map((r) => <span key={r} className="reason">{QUEUE_REASON_LABEL[r]}</span>)}</td>
                        <td>{i.row.summary ? <span className={`level level-${i.row.summary.caseLevel}`}>{LEVEL_LABEL[i.row.summary.caseLevel]}</span> : '—'}</td>
                        <td>{dur(i.row.summary?.firstApneaResponseS)}</td>
                        <td><span className={`review-status ${st}`}>{REVIEW_STATUS_LABEL[st]}</span></td>
                        <td>{i.review?.category ? REVIEW_CATEGORY_LABEL[i.review.category] : <span className="muted">—</span>}</td>
                        <td>{i.review?.reviewer ?? <span className="muted">—</span>}</td>
                        <td><Link className="button small-button" href={`/review/cases/${encodeURIComponent(i.row.caseId)}#review`}>Review</Link></td>
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
