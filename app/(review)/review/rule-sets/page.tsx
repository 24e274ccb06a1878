import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { loadComparison, MAX_COMPARE_CASES } from '@/lib/db/review';
import { findRuleSet, listRuleSets, parseRuleSetRef } from '@/lib/db/ruleSetStore';
import { LEVEL_LABEL } from '@/lib/domain/ruleLabel';
import type { RuleSet } from '@/lib/domain/ruleSet';
import { periodLabel } from '@/lib/review';
import { TopBar } from '../../../top-bar';
import { flatParams, reviewContext } from '../../_shared/review-context';
import { ReviewNav } from '../_ui/review-nav';
import { PeriodPicker } from '../_ui/period-picker';
import { CsvLink } from '../_ui/csv-link';
import { SummariesProgress } from '../_ui/summaries-progress';
import { RuleSetEditor } from '../_ui/rule-set-editor';
import { ci, pct, qs } from '../_ui/format';
import '../review.css';

export const dynamic = 'force-dynamic';

/** Compare the period under another rule set, and create the lead's own rule sets. */
export default async function RuleSetsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireAccess('/review/rule-sets');
  const params = flatParams(await searchParams);
  const ctx = await reviewContext(user, params, false);
  const list = await listRuleSets(db());
  const ref = params.rs ? parseRuleSetRef(params.rs) : null;
  const other: RuleSet | null = ref ? await findRuleSet(db(), ref) : null;
  const active = ctx.unit.ruleSet;
  const cmp = other ? await loadComparison(db(), ctx.unit, { period: ctx.period, other }) : null;
  const baseRef = params.base ? parseRuleSetRef(params.base) : null;
  const base = (baseRef && (await findRuleSet(db(), baseRef))) || other || active;
  const copy = { ...base, id: base.id.endsWith('-local') ? base.id : `${ctx.unit.id}-local`, description: `${ctx.unit.name}: local rules, from ${base.id} v${base.version}` };
  const periodKeep: Record<string, string | undefined> = ctx.period.month ? { month: ctx.period.month } : { from: ctx.period.from, to: ctx.period.to };
  const here = `/review/rule-sets${qs(periodKeep)}`;
  return (
    <>
      <TopBar user={user} />
      <main className="review">
        <div className="review-head">
          <h1>Rule sets · {ctx.unit.name}</h1>
          <p className="muted">The unit&apos;s screens and the review use {active.id} v{active.version}. Choose another rule set to see, for the same cases, how the figures and which cases would change.</p>
        </div>
        <ReviewNav active="rule-sets" period={ctx.period} />
        <PeriodPicker action="/review/rule-sets" period={ctx.period} keep={{ rs: params.rs }} problem={ctx.periodProblem} />

        <section className="panel">
          <h2>Compare with</h2>
          <form method="get" action="/review/rule-sets" className="row">
            {Object.entries(periodKeep).map(([k, v]) => (v ? <input key={k} type="hidden" name={k} value={v} /> : null))}
            <label className="inline">Rule set
              <select name="rs" defaultValue={params.rs ?? ''} data-testid="compare-select">
                <option value="">— choose —</option>
                {list.filter((r) => !(r.id === active.id && r.version === active.version)).map((r) => (
                  <option key={`${r.id}@${r.version}`} value={`${r.id}@${r.version}`}>{r.id} v{r.version}{r.builtIn ? ' (built-in)' : ` (saved${r.createdBy ? ` by ${r.createdBy}` : ''})`}</option>
                ))}
              </select>
            </label>
            <button type="submit" className="primary">Compare</button>
          </form>
          {params.rs && !other && <p className="error" role="alert">Rule set {params.rs} not found.</p>}
        </section>

        {other && cmp && (
          <>
            {cmp.total > MAX_COMPARE_CASES ? (
              <p className="error panel" role="alert">The period has {cmp.total} cases; compare at most {MAX_COMPARE_CASES} at a time. Choose a shorter period.</p>
            ) : cmp.missing > 0 ? (
              <SummariesProgress ruleSet={`${other.id}@${other.version}`} from={ctx.period.from} to={ctx.period.to} missing={cmp.missing} total={cmp.total} />
            ) : null}
            <section className="panel" data-testid="comparison">
              <div className="section-head">
                <h2>{periodLabel(ctx.period)}: {active.id} v{active.version} (A) against {other.id} v{other.version} (B)</h2>
                <CsvLink table="compare" period={ctx.period} extra={{ rs: params.rs }} />
              </div>
              <p className="muted small">Over the {cmp.comparison.cases} cases with a summary under both rule sets{cmp.comparison.missingB ? ` (${cmp.comparison.missingB} not yet computed under B)` : ''}. The same cases are counted twice, so the columns differ only through the rules; “gained” and “lost” are the cases counted under B but not A, and under A but not B.</p>
              <div className="table-scroll">
                <table className="side-by-side">
                  <thead><tr><th>Figure</th><th className="num">A cases</th><th className="num">A rate</th><th>A 95 % CI</th><th className="num">B cases</th><th className="num">B rate</th><th>B 95 % CI</th><th className="num">Gained</th><th className="num">Lost</th></tr></thead>
                  <tbody>
                    {cmp.comparison.figures.map((f) => (
                      <tr key={f.id} data-figure={f.id}>
                        <td>{f.label}</td>
                        <td className="num">{f.a ? f.a.numerator : '—'}</td>
                        <td className="num">{f.a ? pct(f.a.rate) : 'not in A'}</td>
                        <td>{f.a ? ci(f.a) : ''}</td>
                        <td className="num b">{f.b ? f.b.numerator : '—'}</td>
                        <td className="num">{f.b ? pct(f.b.rate) : 'not in B'}</td>
                        <td>{f.b ? ci(f.b) : ''}</td>
                        <td className="num">{f.onlyB ? `+${f.onlyB}` : ''}</td>
                        <td className="num">{f.onlyA ? `−${f.onlyA}` : ''}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              <div className="section-head">
                <h3>Cases that change ({cmp.comparison.changedCases.length})</h3>
                <CsvLink table="compare-cases" period={ctx.period} extra={{ rs: params.rs }} />
              </div>
              {cmp.comparison.changedCases.length === 0 ? (
                <p className="muted">No case changes.</p>
              ) : (
                <table data-testid="changed-cases">
                  <thead><tr><th>Case</th><th>Date</th><th>Level A → B</th><th>What changes</th></tr></thead>
                  <tbody>
                    {cmp.comparison.changedCases.map((x) => (
                      <tr key={x.caseId}>
                        <td>
                          <Link href={`/review/cases/${encodeURIComponent(x.caseId)}`}>{x.key ?? x.caseId}</Link>{' '}
                          <Link className="muted small" href={`/review/cases/${encodeURIComponent(x.caseId)}?rs=${encodeURIComponent(`${other.id}@${other.version}`)}`}>(under B)</Link>
                        </td>
                        <td>{x.date}</td>
                        <td>{LEVEL_LABEL[x.a.caseLevel]} → {LEVEL_LABEL[x.b.caseLevel]}</td>
                        <td><ul className="changes">{x.changes.map((c) => <li key={c}>{c}</li>)}</ul></td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              )}
            </section>
          </>
        )}

        <section className="panel">
          <h2>Rule sets</h2>
          <table data-testid="rule-set-list">
            <thead><tr><th>Rule set</th><th>Version</th><th>Kind</th><th>Rules</th><th /></tr></thead>
            <tbody>
              {list.map((r) => (
                <tr key={`${r.id}@${r.version}`}>
                  <td title={r.description}>{r.id}{r.id === active.id && r.version === active.version ? <span className="reason">in use</span> : null}</td>
                  <td>{r.version}</td>
                  <td>{r.builtIn ? 'built-in' : `saved${r.createdBy ? ` by ${r.createdBy}` : ''}${r.createdAt ? `, ${r.createdAt.slice(0, 10)}` : ''}`}</td>
                  <td className="small">{r.rules.join(', ')}</td>
                  <td className="row">
                    <Link href={`/review/rule-sets${qs({ ...periodKeep, rs: `${r.id}@${r.version}` })}`}>Compare</Link>
                    <Link href={`/review/rule-sets${qs({ ...periodKeep, rs: params.rs, base: `${r.id}@${r.version}` })}#editor`}>Copy to edit</Link>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>

        <section className="panel" id="editor">
          <h2>Create your own rule set</h2>
          <p className="muted small">
            Starting from a copy of {base.id} v{base.version}. Give it an id of your own (built-in ids are reserved). Saving never changes a saved version: a change to a saved id is stored as its next version, and every result names the version it came from. Thresholds are in mmHg, %, /min.
          </p>
          <RuleSetEditor key={`${base.id}@${base.version}`} initial={JSON.stringify(copy, null, 2)} compareHref={here} />
        </section>
      </main>
    </>
  );
}
