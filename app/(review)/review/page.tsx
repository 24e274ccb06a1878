import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { loadReview } from '@/lib/db/review';
import { casesHref, DIMENSION_LABEL, figureCatalogue, monthEnd, monthPeriod, periodLabel, type HeadlineFigure, type Proportion, type ReviewPeriod } from '@/lib/review';
import { ruleLabel } from '@/lib/domain/ruleLabel';
import { TopBar } from '../../top-bar';
import { flatParams, reviewContext } from '../_shared/review-context';
import { PeriodPicker } from './_ui/period-picker';
import { ReviewNav } from './_ui/review-nav';
import { PChartSvg } from './_ui/p-chart';
import { FunnelSvg } from './_ui/funnel-chart';
import { ChartDownload } from './_ui/chart-download';
import { CsvLink } from './_ui/csv-link';
import { ci, dur, num, pct, qs } from './_ui/format';
import { BreakdownTables } from './_ui/breakdown-tables';
import './review.css';

export const dynamic = 'force-dynamic';

/** Column heads of the breakdown tables. */
const SHORT_LABEL: Record<string, string> = { any_episode: 'Any episode', supported_or_above: 'Support or rescue', major_physiology: 'Major physiology', in_review_queue: 'In review queue', apnea_response_over_limit: 'Slow apnea response' };

const KEY_FIGURES = ['any_episode', 'rule:apnea', 'rule:prolonged_apnea', 'rule:hypoxemia', 'supported_or_above', 'level:rescued', 'major_physiology', 'in_review_queue'];

function Count({ p, period, figure, extra }: { p: Proportion; period: ReviewPeriod; figure: string; extra?: { dim: 'procedure' | 'regimen' | 'asa' | 'bmi' | 'stopbang' | 'age' | 'depth' | 'room' | 'proceduralist' | 'nurse'; value: string } }) {
  return (
    <Link href={casesHref(period, { figure, ...(extra ? { dim: extra.dim, value: extra.value } : {}) })} data-testid="count-link">
      {p.numerator}
    </Link>
  );
}

function KeyFigure({ f, period }: { f: HeadlineFigure; period: ReviewPeriod }) {
  return (
    <div className="key-figure" data-testid="key-figure" data-figure={f.id}>
      <span className="kf-label">{f.label}</span>
      <span className="kf-value">
        <Count p={f} period={period} figure={f.id} /> <span className="muted">/ <Link href={casesHref(period, {})}>{f.denominator}</Link></span>
      </span>
      <span className="kf-rate">{pct(f.rate)} <span className="muted">95 % CI {ci(f)}</span></span>
    </div>
  );
}

export default async function ReviewPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireAccess('/review');
  const params = flatParams(await searchParams);
  const ctx = await reviewContext(user, params, false);
  const { review, ruleSet, queue } = await loadReview(db(), ctx.unit, { period: ctx.period, focus: params.focus });
  const { period, headline: h } = review;
  const byId = new Map(h.figures.map((f) => [f.id, f]));
  const keys = KEY_FIGURES.map((id) => byId.get(id)).filter((f): f is HeadlineFigure => !!f);
  const focusChoices = figureCatalogue(h.ruleIds, ctx.unit.reviewResponseLimitS).filter((f) => f.group !== 'level' || f.id === 'level:corrected');
  const periodParams: Record<string, string> = period.month ? { month: period.month } : { from: period.from, to: period.to };
  const ar = h.apneaResponse;
  return (
    <>
      <TopBar user={user} />
      <main className="review">
        <div className="review-head">
          <h1>Monthly review · {ctx.unit.name}</h1>
          <p className="muted">
            Rule set {ruleSet.id} v{ruleSet.version} · signed cases only · every count links to its cases · 95 % intervals are Wilson score intervals.
          </p>
        </div>
        <ReviewNav active="overview" period={period} />
        <PeriodPicker action="/review" period={period} keep={{ focus: params.focus }} problem={ctx.periodProblem} />

        <section className="panel" aria-labelledby="headline-h" data-testid="headline">
          <div className="section-head">
            <h2 id="headline-h">Headline · {periodLabel(period)}</h2>
            <CsvLink table="headline" period={period} />
          </div>
          <div className="key-figures">
            <div className="key-figure" data-testid="sedated-cases">
              <span className="kf-label">Sedated cases reviewed</span>
              <span className="kf-value"><Link href={casesHref(period, {})}>{h.cases}</Link></span>
              <span className="kf-rate muted">{h.withoutSummary ? `${h.withoutSummary} signed without a summary, not counted` : 'signed, with a summary'}</span>
            </div>
            {keys.map((f) => <KeyFigure key={f.id} f={f} period={period} />)}
            <div className="key-figure" data-testid="apnea-response">
              <span className="kf-label">First response to apnea</span>
              <span className="kf-value">{ar.median.value === null ? '—' : `${num(ar.median.value, 0)} s`} <span className="muted">median</span></span>
              <span className="kf-rate">
                90th pct {ar.p90.value === null ? '—' : `${num(ar.p90.value, 0)} s`} · <Link href={casesHref(period, { figure: 'rule:apnea' })}>{ar.responded.numerator} of {ar.responded.denominator}</Link> apneas answered
              </span>
              <span className="muted small">
                median 95 % CI {ar.median.lower ?? '—'}–{ar.median.upper ?? '—'} s · 90th pct CI {ar.p90.lower ?? '—'}–{ar.p90.upper ?? '—'} s · over {ctx.unit.reviewResponseLimitS} s: <Link href={casesHref(period, { figure: 'apnea_response_over_limit' })}>{byId.get('apnea_response_over_limit')?.numerator ?? 0}</Link>
              </span>
            </div>
          </div>
          <p className="muted small">
            Review queue: <Link href={`/review/queue?${new URLSearchParams(periodParams)}`} data-testid="queue-link">{queue.cases} cases</Link>, {queue.toReview} still to review.
          </p>
          <details>
            <summary>All figures: every rule, every level, episodes per 1,000 cases</summary>
            <table className="figures" data-testid="figures-table">
              <thead>
                <tr><th>Figure</th><th className="num">Cases</th><th className="num">Of</th><th className="num">Rate</th><th>95 % CI</th><th className="num">Episodes</th><th>per 1,000 cases (exact 95 % CI)</th></tr>
              </thead>
              <tbody>
                {h.figures.map((f) => {
                  const er = f.group === 'rule' ? h.episodeRates.find((e) => `rule:${e.ruleId}` === f.id) : undefined;
                  return (
                    <tr key={f.id} data-figure={f.id}>
                      <td title={f.meaning}>{f.label}</td>
                      <td className="num"><Count p={f} period={period} figure={f.id} /></td>
                      <td className="num">{f.denominator}</td>
                      <td className="num">{pct(f.rate)}</td>
                      <td>{ci(f)}</td>
                      <td className="num">{er ? er.episodes : ''}</td>
                      <td>{er && er.per1000 !== null ? `${num(er.per1000, 1)} (${num(er.lower, 1)}–${num(er.upper, 1)})` : ''}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </details>
        </section>

        <section className="panel" aria-labelledby="trend-h">
          <div className="section-head">
            <h2 id="trend-h">Month by month: p charts</h2>
            <CsvLink table="monthly" period={period} />
          </div>
          <p className="muted small">
            {review.trend.months[0]} to {review.trend.months[review.trend.months.length - 1]}: the twelve months to the end of the period, by calendar month. Centre line p̄ over the months shown; limits p̄ ± 3√(p̄(1 − p̄)/n) per month. <span className="swatch outside" /> beyond a limit · <span className="swatch run" /> in a run of 8 on one side of p̄ · hollow: month not complete.
          </p>
          <div className="chart-grid">
            {review.trend.series.map((s) => {
              const id = `trend-${s.figure.replace(/[^a-z0-9]+/gi, '-')}`;
              return (
                <figure key={s.figure} className="chart">
                  <PChartSvg id={id} title={s.label} points={s.points} centre={s.centre} hrefs={s.points.map((p) => casesHref(p.month === period.to.slice(0, 7) && period.to < monthEnd(p.month) ? { from: `${p.month}-01`, to: period.to } : monthPeriod(p.month), { figure: s.figure }))} />
                  <figcaption><ChartDownload targetId={id} fileName={`plateau-${id}-${period.from}`} /></figcaption>
                </figure>
              );
            })}
          </div>
        </section>

        <section className="panel" aria-labelledby="people-h">
          <div className="section-head">
            <h2 id="people-h">People and rooms: {review.focusLabel.toLowerCase()}</h2>
            <form method="get" action="/review" className="row">
              {Object.entries(periodParams).map(([k, v]) => <input key={k} type="hidden" name={k} value={v} />)}
              <label className="inline">Compare on
                <select name="focus" defaultValue={review.focus}>
                  {focusChoices.map((f) => <option key={f.id} value={f.id}>{f.label}</option>)}
                </select>
              </label>
              <button type="submit">Show</button>
            </form>
          </div>
          <p className="muted small">
            Funnel plots (Spiegelhalter 2005): target p0 = the unit&apos;s rate this period ({pct(review.funnels.proceduralist.p0)}); exact binomial limits at 95 % (dashed) and 99.8 % (solid). A point outside 99.8 % is an outlier worth a look, not a verdict. Click a point for its cases.
          </p>
          <div className="chart-grid">
            {(['proceduralist', 'nurse'] as const).map((by) => {
              const f = review.funnels[by];
              const id = `funnel-${by}`;
              return (
                <figure key={by} className="chart" data-testid={`funnel-${by}`}>
                  <FunnelSvg id={id} title={`${review.focusLabel} by ${by}`} funnel={f} hrefs={f.points.map((p) => casesHref(period, { figure: review.focus, dim: by, value: p.key }))} />
                  <figcaption>
                    <ChartDownload targetId={id} fileName={`plateau-${id}-${period.from}`} /> <CsvLink table={id} period={period} extra={{ focus: review.focus }} />
                  </figcaption>
                  <details>
                    <summary>Points</summary>
                    <table>
                      <thead><tr><th>{by === 'nurse' ? 'Nurse' : 'Proceduralist'}</th><th className="num">Cases with it</th><th className="num">Cases</th><th className="num">Rate</th><th>95 % limits</th><th>99.8 % limits</th><th /></tr></thead>
                      <tbody>
                        {f.points.map((p) => (
                          <tr key={p.key}>
                            <td>{p.label}</td>
                            <td className="num"><Link href={casesHref(period, { figure: review.focus, dim: by, value: p.key })}>{p.x}</Link></td>
                            <td className="num"><Link href={casesHref(period, { dim: by, value: p.key })}>{p.n}</Link></td>
                            <td className="num">{pct(p.proportion)}</td>
                            <td>{pct(p.limits[0]?.lower)}–{pct(p.limits[0]?.upper)}</td>
                            <td>{pct(p.limits[1]?.lower)}–{pct(p.limits[1]?.upper)}</td>
                            <td>{p.flag === 'outlier' ? <span className="flag outlier">outside 99.8 %</span> : p.flag === 'alert' ? <span className="flag alert">outside 95 %</span> : ''}</td>
                          </tr>
                        ))}
                      </tbody>
                    </table>
                  </details>
                </figure>
              );
            })}
          </div>

          <div className="section-head">
            <h3>Standardised ratio by room (observed / expected)</h3>
            <CsvLink table="oe-room" period={period} extra={{ focus: review.focus }} />
          </div>
          <p className="muted small">
            Expected = each room&apos;s cases weighted by the whole unit&apos;s rate in the same ASA class × procedure × regimen stratum over the reference period {review.reference.from} to {review.reference.to} ({review.observedExpected.reference.cases} cases, {review.observedExpected.reference.events} with the figure). Exact Poisson 95 % limits on O, divided by E. Cases in strata the reference never saw are left out of both O and E.
          </p>
          <table data-testid="oe-table">
            <thead><tr><th>Room</th><th className="num">Cases</th><th className="num">Observed</th><th className="num">Expected</th><th className="num">O / E</th><th>95 % CI</th><th className="num">Not rated</th></tr></thead>
            <tbody>
              {[...review.observedExpected.rooms, review.observedExpected.total].map((r) => (
                <tr key={r.key} className={r.key === 'total' ? 'total' : undefined}>
                  <td>{r.label}</td>
                  <td className="num">{r.key === 'total' ? <Link href={casesHref(period, {})}>{r.cases}</Link> : <Link href={casesHref(period, { dim: 'room', value: r.key })}>{r.cases}</Link>}</td>
                  <td className="num">{r.key === 'total' ? <Link href={casesHref(period, { figure: review.focus })}>{r.observed}</Link> : <Link href={casesHref(period, { figure: review.focus, dim: 'room', value: r.key })}>{r.observed}</Link>}</td>
                  <td className="num">{num(r.expected, 1)}</td>
                  <td className="num">{num(r.ratio, 2)}</td>
                  <td>{r.lower === null ? '—' : `${num(r.lower, 2)}–${num(r.upper, 2)}`}</td>
                  <td className="num">{r.casesUnrated}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>

        <section className="panel" aria-labelledby="breakdown-h">
          <h2 id="breakdown-h">Breakdowns</h2>
          <p className="muted small">Each table&apos;s rows add up to the total: every case sits in exactly one row (missing facts in their own row). Cells: cases with the figure, and their share of the row.</p>
          <BreakdownTables
            period={period}
            figures={review.breakdownFigures.map((f) => ({ id: f.id, label: f.id.startsWith('rule:') ? ruleLabel(f.id.slice(5)) : (SHORT_LABEL[f.id] ?? f.label) }))}
            data={review.breakdowns.map((b) => {
              const line = (r: (typeof b.rows)[number]) => ({ key: r.key, label: r.label, cases: r.cases, cells: b.figures.map((f) => [r.cells[f].numerator, r.cells[f].rate, r.cells[f].lower, r.cells[f].upper] as [number, number | null, number, number]) });
              return { dimension: b.dimension, label: DIMENSION_LABEL[b.dimension], rows: b.rows.map(line), total: line(b.total) };
            })}
            csvHref={Object.fromEntries(review.breakdowns.map((b) => [b.dimension, `/api/v1/review/export${qs({ table: `breakdown-${b.dimension}`, from: period.from, to: period.to, focus: review.focus })}`]))}
          />
        </section>
        <p className="muted small">Response times: {ar.values.length} first responses; longest {ar.values.length ? dur(Math.max(...ar.values)) : '—'}. Methods and definitions: docs/review.md.</p>
      </main>
    </>
  );
}
