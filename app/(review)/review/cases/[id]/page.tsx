import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requireAccess } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { loadReviewCase } from '@/lib/db/review';
import { now } from '@/lib/server/clock';
import { ABRUPT_ZERO_HINT, LEVEL_LABEL } from '@/lib/domain/ruleLabel';
import { QUEUE_REASON_LABEL } from '@/lib/domain/review';
import { REGIMEN_LABEL } from '@/lib/domain/regimen';
import { DEPTH_LABEL, PROCEDURE_LABEL } from '@/lib/domain/caseFacts';
import { TrendChart } from '@/app/(bedside)/cases/[id]/trend-chart';
import { TopBar } from '../../../../top-bar';
import { flatParams, reviewContext, ruleSetParam } from '../../../_shared/review-context';
import { ReviewNav } from '../../_ui/review-nav';
import { ReviewForm } from '../../_ui/review-form';
import { clockAt, dur, rel } from '../../_ui/format';
import '../../review.css';

export const dynamic = 'force-dynamic';

/** One case's evidence for the review: timeline, each episode's chart segment (± 2 min) with what happened around it, and the review form. */
export default async function ReviewCasePage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireAccess('/review/cases/[id]');
  const { id } = await params;
  const sp = flatParams(await searchParams);
  const ctx = await reviewContext(user, sp, false);
  let other;
  try {
    other = await ruleSetParam(sp.rs);
  } catch {
    other = undefined;
  }
  const data = await loadReviewCase(db(), ctx.unit, id, now(), other);
  if (!data) notFound();
  const c = data.case;
  const startMs = Date.parse(c.startAt);
  const a = data.analysis;
  return (
    <>
      <TopBar user={user} />
      <main className="review">
        <ReviewNav active="cases" period={ctx.period} />
        <div className="section-head">
          <h1 data-testid="review-case-title">Case {c.key ?? c.id} · {c.date}</h1>
          <Link href={`/cases/${encodeURIComponent(c.id)}`}>Open the case sheet</Link>
        </div>
        {(data.ruleSet.id !== data.activeRuleSet.id || data.ruleSet.version !== data.activeRuleSet.version) && (
          <p className="warn-line">Shown under rule set {data.ruleSet.id} v{data.ruleSet.version}; the unit uses {data.activeRuleSet.id} v{data.activeRuleSet.version}. <Link href={`/review/cases/${encodeURIComponent(c.id)}`}>Show under the unit&apos;s rule set</Link></p>
        )}
        <div className="review-grid">
          <div className="sheet-main">
            <section className="panel">
              <div className="case-facts">
                <div><span>Room</span>{c.room ?? '—'}</div>
                <div><span>Procedure</span>{PROCEDURE_LABEL[c.procedureType] ?? c.procedureType}</div>
                <div><span>Planned depth</span>{DEPTH_LABEL[c.plannedDepth] ?? c.plannedDepth}{c.reachedDepth ? ` (reached ${c.reachedDepth})` : ''}</div>
                <div><span>ASA</span>{c.asaClass ?? '—'}{c.asaEmergency ? 'E' : ''}</div>
                <div><span>Patient</span>{c.ageYears ?? '?'} years, {c.sex}</div>
                <div><span>Regimen</span>{c.regimen ? REGIMEN_LABEL[c.regimen] : '—'}</div>
                <div><span>Proceduralist</span>{c.proceduralist ?? '—'}</div>
                <div><span>Sedation nurse</span>{c.nurse ?? '—'}</div>
                <div><span>Case level</span>{a ? <span className={`level level-${a.caseLevel}`} data-testid="case-level">{LEVEL_LABEL[a.caseLevel]}</span> : '—'}</div>
                <div><span>Rule set</span>{data.ruleSet.id} v{data.ruleSet.version}</div>
              </div>
              {data.queueReasons.length > 0 && (
                <p>In the review queue: {data.queueReasons.map((r) => <span key={r} className="reason" data-testid="queue-reason">{QUEUE_REASON_LABEL[r]}</span>)}</p>
              )}
              {a?.summary.majorPhysiology && <p className="warn-line">Major physiology: a prolonged apnea or prolonged or critical hypoxemia.</p>}
            </section>

            <section className="panel" aria-labelledby="timeline-h">
              <h2 id="timeline-h">Timeline</h2>
              <table className="timeline" data-testid="timeline">
                <thead><tr><th>Time</th><th>From start</th><th>What</th><th /></tr></thead>
                <tbody>
                  {data.timeline.map((e, i) => (
                    <tr key={i} data-kind={e.kind}>
                      <td>{clockAt(c.startAt, e.t, c.timeZone)}</td>
                      <td className="muted">{rel(e.t)}</td>
                      <td>
                        <span className="kind">{e.kind === 'episode' ? 'episode' : e.kind}</span>{' '}
                        {e.episode !== undefined ? <a href={`#episode-${e.episode}`}>{e.label}</a> : e.label}
                      </td>
                      <td>{e.level && e.kind !== 'dose' ? <span className={`level level-${e.level}`}>{LEVEL_LABEL[e.level]}</span> : null}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </section>

            {!a && <p className="muted">No analysis for this case yet.</p>}
            {a && data.episodes.length === 0 && <p className="muted panel">No respiratory episode under this rule set.</p>}
            {data.episodes.map((e) => (
              <section key={e.index} id={`episode-${e.index}`} className={`panel episode level-${e.level}`} data-testid="episode-segment" data-rule={e.rule}>
                <h3>
                  {e.label} · {clockAt(c.startAt, e.start, c.timeZone)}–{clockAt(c.startAt, e.end, c.timeZone)} · {dur(e.durationS)}
                  <span className={`level level-${e.level}`}>{LEVEL_LABEL[e.level]}</span>
                </h3>
                <div className="episode-facts">
                  <span>First response: {e.responseS === null ? <span className="muted">none recorded</span> : dur(e.responseS)}</span>
                  {e.extremes.map((x) => <span key={x.channel}>{x.kind === 'lowest' ? 'Lowest' : 'Highest'} {x.channel === 'etco2' ? 'EtCO2' : x.channel === 'spo2' ? 'SpO2' : x.channel.toUpperCase()} {x.value} {x.unit}</span>)}
                  <span>Last sedative dose: {e.lastDose ?? <span className="muted">none before</span>}</span>
                  {e.censored && <span className="muted">cut off by a data gap</span>}
                </div>
                {e.onsetAbrupt && <p className="hint" role="note">{ABRUPT_ZERO_HINT}</p>}
                <TrendChart series={e.series} episodes={e.shaded} markers={e.markers} startMs={startMs} timeZone={c.timeZone} etco2Unit={c.etco2Unit} height={240} testId="episode-chart" />
                <div className="around">
                  <div>
                    <h4>Doses in the window (± 2 min)</h4>
                    {e.doses.length ? <ul className="plain">{e.doses.map((d, i) => <li key={i}>{clockAt(c.startAt, d.t, c.timeZone)} · {d.label}</li>)}</ul> : <p className="muted small">None.</p>}
                  </div>
                  <div>
                    <h4>Interventions in the window</h4>
                    {e.interventions.length ? <ul className="plain">{e.interventions.map((d, i) => <li key={i}>{clockAt(c.startAt, d.t, c.timeZone)} · {d.label} <span className={`level level-${d.level}`}>{LEVEL_LABEL[d.level]}</span></li>)}</ul> : <p className="muted small">None.</p>}
                  </div>
                </div>
                <details>
                  <summary>Samples, every 5 s ({e.samples.length} rows)</summary>
                  <table className="samples" data-testid="episode-samples">
                    <thead><tr><th>Time</th><th className="num">EtCO2 (mmHg)</th><th className="num">RR (/min)</th><th className="num">SpO2 (%)</th><th className="num">HR (/min)</th></tr></thead>
                    <tbody>
                      {e.samples.map((s) => (
                        <tr key={s.t} className={s.t >= e.start && s.t < e.end ? 'in-episode' : undefined}>
                          <td>{clockAt(c.startAt, s.t, c.timeZone)}</td>
                          <td className="num">{s.etco2 ?? ''}</td>
                          <td className="num">{s.rr ?? ''}</td>
                          <td className="num">{s.spo2 ?? ''}</td>
                          <td className="num">{s.hr ?? ''}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </details>
              </section>
            ))}
          </div>
          <ReviewForm caseId={c.id} initial={data.review} />
        </div>
      </main>
    </>
  );
}
